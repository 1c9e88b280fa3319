// GET /api/admin/users — every user with roles, department and status (admins only).
import { route } from "@/lib/http/route";
import { listUsers } from "@/lib/users/queries";

export const GET = route({ access: "admin.users" }, async ({ user }) => ({ users: await listUsers(user) }));
