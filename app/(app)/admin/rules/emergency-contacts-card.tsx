import { Card } from "@/app/_components/card";
import { readInstitutionSettings } from "@/lib/settings/queries";
import { EmergencyContactsForm } from "./emergency-contacts-form";

// The emergency contacts on the Rules page: its own server component, reading its own setting, so
// the page gains one line.
export async function EmergencyContactsCard() {
  const { emergencyContacts } = await readInstitutionSettings();
  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
      <Card
        title="Emergency contacts"
        description="Printed on every permit and bench card rendered from now on. The first is the emergency phone on the live sheet that responders carry (Live now)."
      >
        <EmergencyContactsForm contacts={emergencyContacts} />
      </Card>
    </div>
  );
}
