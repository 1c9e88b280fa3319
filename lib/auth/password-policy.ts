import "server-only";
import { dictionary } from "@zxcvbn-ts/language-common";

// Password rules (ASVS 2.1 / 6.2): 12 to 128 characters, no composition rules, and not a commonly
// used password. The list is the common-password dictionary shipped by @zxcvbn-ts/language-common
// (about 30 000 entries drawn from leaked-password corpora).

const common = new Set<string>((dictionary["passwords-common"] as string[]).map((p) => p.toLowerCase()));
const CONTEXT_WORDS = ["benchclear", "aldermere", "password", "passwort", "qwerty"];

export function passwordProblem(password: string, context: { email?: string; name?: string } = {}): string | null {
  const lower = password.toLowerCase();
  if (common.has(lower)) return "That password is on a list of commonly used passwords. Choose another.";
  // A common password padded with digits or symbols ("password123456!") is still guessable.
  const core = lower.replace(/[^a-z]+$/g, "").replace(/^[^a-z]+/g, "");
  if (core.length >= 4 && common.has(core) && core.length >= lower.length - 6) {
    return "That password is a common password with a few characters added. Choose another.";
  }
  if (new Set(lower).size < 4) return "That password repeats too few characters. Choose another.";
  const local = context.email?.split("@")[0]?.toLowerCase();
  const words = [...CONTEXT_WORDS, ...(local && local.length >= 4 ? [local] : [])];
  if (words.some((w) => lower === w || (lower.includes(w) && lower.length - w.length < 6))) {
    return "That password is too close to the product name or your e-mail. Choose another.";
  }
  return null;
}
