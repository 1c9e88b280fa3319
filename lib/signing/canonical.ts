import crypto from "node:crypto";

// Canonical JSON: object keys sorted at every depth, no insignificant white space, -0 as 0. A
// signature's SHA-256 is taken over this form, so the same content always hashes the same way
// whatever order its keys were written in.

export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortDeep(value));
}

function sortDeep(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortDeep);
  if (value && typeof value === "object" && !(value instanceof Date)) {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(value as Record<string, unknown>).sort()) {
      const v = (value as Record<string, unknown>)[key];
      if (v !== undefined) out[key] = sortDeep(v);
    }
    return out;
  }
  if (typeof value === "number" && Object.is(value, -0)) return 0;
  return value;
}

export function sha256Hex(text: string): string {
  return crypto.createHash("sha256").update(text, "utf8").digest("hex");
}

/** The hash a decision signs: content and assessment of one revision, canonically serialised. */
export function revisionHash(content: unknown, assessment: unknown): string {
  return sha256Hex(canonicalJson({ assessment, content }));
}
