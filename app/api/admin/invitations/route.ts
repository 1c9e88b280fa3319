// POST /api/admin/invitations — an admin invites a person by e-mail with roles and a department; the
// single-use link (7 days) goes out through the mail outbox and never appears in this answer.
import { route } from "@/lib/http/route";
import { inviteUser } from "@/lib/users/actions";
import { listPendingInvitations } from "@/lib/users/queries";
import { inviteSchema } from "@/lib/auth/schemas";

export const POST = route({ access: "admin.users", body: inviteSchema }, async ({ user, body }) => {
  const { invitation } = await inviteUser(user, body);
  return Response.json({ invitation }, { status: 201 });
});

// GET /api/admin/invitations — open invitations.
export const GET = route({ access: "admin.users" }, async ({ user }) => ({
  invitations: await listPendingInvitations(user),
}));
