// GET /api/admin/settings — the institution settings an admin may change (the permit number prefix).
// PATCH /api/admin/settings — change them ({ permitPrefix }); permits issued from then on use the new
// prefix, issued ones keep their numbers.
import { route } from "@/lib/http/route";
import { updateSettings } from "@/lib/settings/actions";
import { editableSettings } from "@/lib/settings/queries";
import { settingsPatchSchema } from "@/lib/settings/schemas";

export const GET = route({ access: "admin.rules" }, async () => ({ settings: await editableSettings() }));

export const PATCH = route({ access: "admin.rules", body: settingsPatchSchema }, async ({ user, body }) => ({
  settings: await updateSettings(user, body),
}));
