// PATCH /api/admin/users/[id] — set roles or department, disable or re-enable a user. Ends that
// user's sessions on their next request.
import { route } from "@/lib/http/route";
import { updateUser } from "@/lib/users/actions";
import { updateUserSchema } from "@/lib/auth/schemas";

export const PATCH = route(
  { access: "admin.users", body: updateUserSchema, ids: { id: "That user" } },
  async ({ user, body, params }) => {
    return { user: await updateUser(user, params.id, body) };
  },
);
