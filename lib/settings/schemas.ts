import { z } from "zod";

// What an admin may change in the institution's settings (PATCH /api/admin/settings), and the rule for
// a permit number's prefix. The database checks the same pattern (institution_settings_permit_prefix_format).

export const DEFAULT_PERMIT_PREFIX = "HV";

/** 1–6 characters, upper-case letters and digits, starting with a letter: "HV", "PHYS", "HV2". */
export const PERMIT_PREFIX_PATTERN = /^[A-Z][A-Z0-9]{0,5}$/;

export const permitPrefixSchema = z
  .string()
  .trim()
  .min(1, "Give a prefix.")
  .max(6, "Use at most 6 characters.")
  .regex(/^[A-Z]/, "Start with an upper-case letter (A–Z).")
  .regex(PERMIT_PREFIX_PATTERN, "Use only upper-case letters A–Z and digits 0–9.");

export const settingsPatchSchema = z.strictObject({ permitPrefix: permitPrefixSchema });

export type SettingsPatch = z.infer<typeof settingsPatchSchema>;
