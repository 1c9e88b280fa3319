import "server-only";
import { db } from "@/db";
import { institutionSettings } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { DEFAULT_PERMIT_PREFIX } from "./schemas";

// Reads of the institution's one settings row. Before the row exists (a fresh database without the
// demo data) the defaults apply.

export type EditableSettings = { permitPrefix: string };

export async function editableSettings(tx: DbOrTx = db): Promise<EditableSettings> {
  const [row] = await tx.select({ permitPrefix: institutionSettings.permitPrefix }).from(institutionSettings).limit(1);
  return { permitPrefix: row?.permitPrefix ?? DEFAULT_PERMIT_PREFIX };
}

/** The prefix new permit numbers take (read inside the approving transaction). */
export async function permitPrefix(tx: DbOrTx = db): Promise<string> {
  return (await editableSettings(tx)).permitPrefix;
}
