import { z } from "zod";
import { notFound } from "@/lib/errors";

const uuid = z.uuid();

/** A record id from the URL: anything that is not a UUID names no record (404, like a missing one). */
export function idParam(value: string | undefined, what: string): string {
  const parsed = uuid.safeParse(value);
  if (!parsed.success) throw notFound(what);
  return parsed.data;
}
