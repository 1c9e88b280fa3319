import type { PermitState } from "@/db/schema/permits";
import type { EmergencyContact } from "@/db/schema/settings";
import type { Assessment, SetupInput, Tier } from "@/lib/hazard";

// Everything a printed permit shows, gathered from the database at one moment (lib/pdf/data.ts). It
// is stored beside the rendered files as JSON and hashed: the storage key of a permit's documents is
// the SHA-256 of this snapshot, so the A4 sheet, the Letter sheet and the bench card always print the
// same facts, and a new snapshot (a new state) gets new files.

export type PaperSize = "a4" | "letter";
/** The permit, its bench card, and the full assessment for the file (assessment-document.tsx). */
export type DocumentKind = "permit" | "bench-card" | "assessment";

export type PrintSignature = {
  name: string;
  role: string;
  meaning: string;
  kind: string;
  /** ISO 8601, UTC. */
  signedAt: string;
};

export type PrintControl = { text: string; confirmed: boolean; note: string };

export type PrintData = {
  /** Bumped when the printed layout changes in a way that should re-render stored files. */
  layoutVersion: number;
  institution: { name: string; emergencyContacts: EmergencyContact[]; timeZone: string };
  permit: {
    number: string;
    /** The effective state when the snapshot was taken (expired once validTo has passed). */
    state: PermitState;
    tier: Tier;
    tierLabel: string;
    validFrom: string;
    validTo: string;
    /** Why the window reaches beyond the event days; null when it does not. */
    validityReason: string | null;
    /** ISO 8601, UTC. */
    issuedAt: string;
    revokedOn: string | null;
    revokedReason: string | null;
    conditions: string[];
    verificationCode: string;
    verificationUrl: string;
    /**
     * The signed-in page for recording a pre-use check (/permits/<id>/check), behind the bench card's
     * second QR code. Absent from snapshots taken before layout 3.
     */
    checkUrl?: string;
  };
  holderName: string;
  event: {
    title: string;
    kindLabel: string;
    room: string;
    audienceLabel: string;
    audienceSize: number;
    /** The event days the application asked for (ISO days; empty when a revision has none). */
    firstDay: string;
    lastDay: string;
    responsible: string;
    operators: { name: string; trained: boolean }[];
  };
  apparatus: { name: string; room: string; notes: string };
  setup: SetupInput;
  assessment: Assessment;
  controls: PrintControl[];
  additionalControls: string;
  signatures: PrintSignature[];
};
