import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/db";
import { institutionSettings } from "@/db/schema";
import { writeAudit } from "@/lib/audit";
import { assertCan, type CurrentUser } from "@/lib/auth/guards";
import { editableSettings, type EditableSettings } from "./queries";
import { readInstitutionSettings } from "./queries";
import type { EmergencyContactsInput, SettingsPatch } from "./schemas";

// Changes to the institution's settings, audited. A new permit prefix applies to permits issued from
// then on; issued permits keep their numbers, and the year's sequence runs on across the change.

export async function updateSettings(actor: CurrentUser, patch: SettingsPatch): Promise<EditableSettings> {
  assertCan(actor, "admin.rules");
  return db.transaction(async (tx) => {
    const before = await editableSettings(tx);
    // The row exists once the institution is set up; on an empty database an empty name means
    // "not set", which every reader replaces with its default.
    await tx
      .insert(institutionSettings)
      .values({ id: 1, name: "", permitPrefix: patch.permitPrefix })
      .onConflictDoUpdate({
        target: institutionSettings.id,
        set: { permitPrefix: patch.permitPrefix, updatedAt: sql`now()` },
      });
    await writeAudit(tx, {
      actor,
      action: "settings.updated",
      entityType: "institution_settings",
      entityId: "1",
      data: { permitPrefix: { from: before.permitPrefix, to: patch.permitPrefix } },
    });
    return { permitPrefix: patch.permitPrefix };
  });
}

/** Replaces the emergency contacts (permits and bench cards rendered from now on, the live sheet). */
export async function updateEmergencyContacts(
  actor: CurrentUser,
  input: EmergencyContactsInput,
): Promise<EmergencyContactsInput> {
  assertCan(actor, "admin.rules");
  return db.transaction(async (tx) => {
    const before = await readInstitutionSettings(tx);
    await tx
      .insert(institutionSettings)
      .values({ id: 1, name: "", emergencyContacts: input.contacts })
      .onConflictDoUpdate({
        target: institutionSettings.id,
        set: { emergencyContacts: input.contacts, updatedAt: sql`now()` },
      });
    await writeAudit(tx, {
      actor,
      action: "settings.emergency_contacts_updated",
      entityType: "institution_settings",
      entityId: "1",
      data: { emergencyContacts: { from: before.emergencyContacts, to: input.contacts } },
    });
    return { contacts: input.contacts };
  });
}
