// GET /api/applications/people?q= — people to name on an application (responsible person,
// operators): active users whose name matches, with their department. No e-mail addresses.
import { searchPeople } from "@/lib/applications/queries";
import { route } from "@/lib/http/route";
import { peopleQuerySchema } from "@/lib/applications/schemas";

export const GET = route({ access: "application.create", query: peopleQuerySchema }, async ({ user, query }) => ({
  people: await searchPeople(user, query.q),
}));
