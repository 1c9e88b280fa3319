// From a frozen revision's content back to the form's working copy (applicationDraftSchema in
// lib/applications/schemas.ts). A renewal starts from the permit's revision this way, with the event
// dates cleared, every control to be confirmed again and the attestation to be given again;
// attachments stay with the earlier application and the holder uploads current ones. Pure.

import { setupToText } from "@/lib/apparatus/setup-text";
import {
  applicationContentSchema,
  applicationDraftSchema,
  type ApplicationContent,
  type ApplicationDraft,
} from "@/lib/applications/schemas";

type Options = { clearDates: boolean; clearConfirmations: boolean };

/** The draft that submits back into this content (attestation still to be given). */
export function draftFromContent(
  content: ApplicationContent,
  options: Options = { clearDates: false, clearConfirmations: false },
): ApplicationDraft {
  const person = (p: { userId: string | null; name: string; trained?: boolean }) => ({
    userId: p.userId,
    name: p.name,
    trained: p.trained ?? false,
  });
  return applicationDraftSchema.parse({
    event: {
      title: content.event.title,
      kind: content.event.kind,
      room: content.event.room,
      audience: content.event.audience,
      audienceSize: String(content.event.audienceSize),
      firstDay: options.clearDates ? "" : content.event.firstDay,
      lastDay: options.clearDates ? "" : content.event.lastDay,
      responsible: person(content.event.responsible),
      operators: content.event.operators.map(person),
    },
    apparatus: {
      apparatusId: content.apparatus.apparatusId,
      apparatusRevisionId: content.apparatus.apparatusRevisionId,
      name: content.apparatus.name,
      room: content.apparatus.room,
      notes: content.apparatus.notes,
      setup: setupToText(content.apparatus.setup),
    },
    controls: {
      required: content.controls.required.map((c) => ({
        code: c.code,
        confirmed: options.clearConfirmations ? false : c.confirmed,
        note: c.note,
      })),
      additional: content.controls.additional,
    },
    attestation: { accepted: false },
  });
}

/** The draft a renewal starts from; `stored` is the permit revision's content as kept in the database. */
export function renewalDraft(stored: unknown, fallbackTitle: string): ApplicationDraft {
  const parsed = applicationContentSchema.safeParse(stored);
  if (!parsed.success) {
    // A revision always passed this schema when it was frozen; should the schema ever move on, start
    // from the title alone rather than refuse the renewal.
    return applicationDraftSchema.parse({ event: { title: fallbackTitle } });
  }
  return draftFromContent(parsed.data, { clearDates: true, clearConfirmations: true });
}
