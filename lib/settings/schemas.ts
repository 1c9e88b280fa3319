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

// The institution's emergency contacts (PUT /api/admin/emergency-contacts): printed on every permit
// and bench card, and the first one is the emergency phone of the live sheet (/live). At least one,
// so the sheet always has a number to call; at most 5, what the bench card prints.
export const MAX_EMERGENCY_CONTACTS = 5;

/** E.164 (ITU-T) allows at most 15 digits; a short emergency number (112, 999) has 3. */
const PHONE_DIGITS = { min: 3, max: 15 } as const;

/** Digits and the separators people write; a leading + for an international number. */
const PHONE_PATTERN = /^\+?[0-9(][0-9 ()./-]*$/;

export const emergencyPhoneSchema = z
  .string()
  .trim()
  .min(1, "Enter the phone number.")
  .max(30, "Use at most 30 characters.")
  .regex(PHONE_PATTERN, "Use digits, spaces, ( ) . / - and a leading + only.")
  .refine(
    (value) => {
      // Counted only for text the pattern accepts: one message per mistake.
      if (!PHONE_PATTERN.test(value)) return true;
      const digits = value.replace(/\D/g, "").length;
      return digits >= PHONE_DIGITS.min && digits <= PHONE_DIGITS.max;
    },
    { message: `A phone number has ${PHONE_DIGITS.min} to ${PHONE_DIGITS.max} digits.` },
  );

export const emergencyContactSchema = z.strictObject({
  label: z.string().trim().min(1, "Say who answers (e.g. Campus security).").max(60, "Use at most 60 characters."),
  phone: emergencyPhoneSchema,
});

export const emergencyContactsSchema = z.strictObject({
  contacts: z
    .array(emergencyContactSchema)
    .min(1, "Give at least one emergency contact: the live sheet prints the first one.")
    .max(MAX_EMERGENCY_CONTACTS, `Give at most ${MAX_EMERGENCY_CONTACTS} contacts (what the bench card prints).`),
});

export type EmergencyContactsInput = z.infer<typeof emergencyContactsSchema>;
