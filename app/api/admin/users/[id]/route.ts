// PATCH /api/admin/users/[id] — set roles or department, disable or re-enable a user. Ends that
// user's sessions on their next request.
import { z } from "zod";
import { fromZodError } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { updateUser } from "@/lib/users/actions";
import { updateUserSchema } from "@/lib/auth/schemas";

const idSchema = z.uuid({ error: "must be a user id" });

export const PATCH = route({ access: "admin.users", body: updateUserSchema }, async ({ user, body, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) throw fromZodError(id.error, "id");
  return { user: await updateUser(user, id.data, body) };
});
