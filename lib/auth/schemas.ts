import { z } from "zod";
import { safeReturnPath } from "@/lib/http/return-path";
import { ROLES } from "@/lib/roles";

// Schemas for sign-in, invitations and passwords, shared by the forms and the server.

export const PASSWORD_MIN = 12;
export const PASSWORD_MAX = 128;

export const emailSchema = z
  .string({ error: "Enter an e-mail address." })
  .trim()
  .min(1, "Enter an e-mail address.")
  .max(320, "That e-mail address is too long.")
  .pipe(z.email({ error: "Enter a valid e-mail address." }))
  .transform((v) => v.toLowerCase());

/**
 * A path inside this site to return to after signing in, resolved against our origin and reduced to
 * path and query (lib/http/return-path.ts); anything else, too long ones included, becomes "/".
 */
export const returnPathSchema = z
  .string()
  .optional()
  .transform((v) => safeReturnPath(v));

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string({ error: "Enter your password." }).min(1, "Enter your password.").max(1024),
  from: returnPathSchema,
});

export const newPasswordSchema = z
  .string({ error: "Enter a password." })
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const roleListSchema = z
  .array(z.enum(ROLES, { error: "Unknown role." }))
  .min(1, "Choose at least one role.")
  .max(ROLES.length)
  .transform((roles) => [...new Set(roles)]);

export const inviteSchema = z.object({
  email: emailSchema,
  name: z.string().trim().min(1, "Enter the person's name.").max(120, "Use at most 120 characters."),
  roles: roleListSchema,
  departmentId: z.uuid({ error: "Choose a department." }).nullable(),
});

export const acceptInviteSchema = z.object({
  token: z.string().min(20).max(200),
  password: newPasswordSchema,
});

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, "Enter your current password.").max(1024),
  newPassword: newPasswordSchema,
});

export const updateUserSchema = z
  .object({
    roles: roleListSchema.optional(),
    departmentId: z.uuid({ error: "Choose a department." }).nullable().optional(),
    disabled: z.boolean().optional(),
  })
  .refine((v) => v.roles !== undefined || v.departmentId !== undefined || v.disabled !== undefined, {
    message: "Nothing to change.",
  });

/** Starting institutional sign-in: where to return, and whether to insist on a fresh sign-in. */
export const institutionSignInSchema = z.object({
  from: returnPathSchema,
  reauth: z.boolean().optional().default(false),
});
