import { z } from "zod";

// The parts every signed request body shares (review decisions, permit revocation). The signer, their
// role, the state and the content hash are never taken from the client. `expectedVersion` is the
// optimistic-concurrency token the page was rendered with; a stale one answers 409.

export const expectedVersion = z.number({ error: "Reload the page: the version is missing." }).int().min(1);
// Optional in the schema: a signer who signs in through the institution's provider confirms who they
// are there instead (lib/signing/password.ts), and a password signer without one gets the same
// "Enter your password to sign." on the `password` field from the check itself.
export const signingPassword = z.string({ error: "Enter your password to sign." }).max(1024).optional();
