// POST /api/invitations/accept — the invited person sets their password with the link's token; the
// account is created, the link is spent, and they are signed in.
import { signIn } from "@/auth";
import { PASSWORDS_OFF_MESSAGE, signInMethods } from "@/lib/auth/sign-in-methods";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { acceptInvitation } from "@/lib/users/actions";
import { acceptInviteSchema } from "@/lib/auth/schemas";

export const POST = route({ access: "public", body: acceptInviteSchema }, async ({ body }) => {
  if (!signInMethods().password) throw new AppError("forbidden", PASSWORDS_OFF_MESSAGE);
  const user = await acceptInvitation(body.token, body.password);
  await signIn("credentials", { email: user.email, password: body.password, redirect: false });
  return Response.json({ ok: true, user: { id: user.id, email: user.email, name: user.name } }, { status: 201 });
});
