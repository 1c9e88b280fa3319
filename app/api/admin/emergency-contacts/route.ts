// GET /api/admin/emergency-contacts — the institution's emergency contacts (label and phone).
// PUT /api/admin/emergency-contacts — replace them ({ contacts: [{ label, phone }] }, 1 to 5); the
// first is the emergency phone printed on the live sheet (/live), all are printed on permits.
import { route } from "@/lib/http/route";
import { updateEmergencyContacts } from "@/lib/settings/actions";
import { readInstitutionSettings } from "@/lib/settings/queries";
import { emergencyContactsSchema } from "@/lib/settings/schemas";

export const GET = route({ access: "admin.rules" }, async () => ({
  contacts: (await readInstitutionSettings()).emergencyContacts,
}));

export const PUT = route({ access: "admin.rules", body: emergencyContactsSchema }, async ({ user, body }) =>
  updateEmergencyContacts(user, body),
);
