import { z } from "zod";

// Record ids in URLs are UUIDs. Anything else names no record, so routes (route()'s `ids`) and pages
// answer it with the same 404 as a record that does not exist: one status for a bad id.
const RECORD_ID = z.uuid();

export function isRecordId(value: unknown): value is string {
  return RECORD_ID.safeParse(value).success;
}
