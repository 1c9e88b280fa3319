// GET /api/search?q=… — the search page's results as JSON: permits, applications, apparatus and
// people matching q (2 to 100 characters; 422 names `q` otherwise), only those the caller may see.
import { route } from "@/lib/http/route";
import { search } from "@/lib/search/queries";
import { searchQuerySchema } from "@/lib/search/schemas";

export const GET = route({ access: "search", query: searchQuerySchema }, async ({ user, query }) => {
  return { results: await search(user, query.q) };
});
