import { z } from "zod";
import { expectedVersion, signingPassword as password } from "@/lib/signing/schemas";

// Request bodies of the permit endpoints, shared by the revoke form and the server.

export const revokeBodySchema = z.object({
  expectedVersion,
  password,
  reason: z.string().trim().min(1, "Give the reason for revoking.").max(2000, "Use at most 2000 characters."),
});

export type RevokeBody = z.infer<typeof revokeBodySchema>;
