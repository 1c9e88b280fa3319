// POST /api/me/password — the signed-in user changes their own password (current one required). Other
// sessions end; this one is renewed.
import { signIn } from "@/auth";
import { PASSWORDS_OFF_MESSAGE, signInMethods } from "@/lib/auth/sign-in-methods";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { changePassword } from "@/lib/users/actions";
import { changePasswordSchema } from "@/lib/auth/schemas";

export const POST = route({ access: "user", body: changePasswordSchema }, async ({ user, body }) => {
  if (!signInMethods().password) throw new AppError("forbidden", PASSWORDS_OFF_MESSAGE);
  await changePassword(user, body.currentPassword, body.newPassword);
  await signIn("credentials", { email: user.email, password: body.newPassword, redirect: false });
  return { ok: true };
});
