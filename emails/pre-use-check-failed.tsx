import { appLink, formatInstant, type EmailBuilder } from "./context";

// To the permit's holder and the safety officers, at once: a pre-use check at the bench found an item
// not in order. The set-up should not be run until it is put right and checked again.
export const preUseCheckFailedEmail: EmailBuilder<"pre_use_check_failed"> = (data, ctx) => ({
  preheader: `A pre-use check of permit ${data.permitNumber} answered "no" to ${data.failed.length} item(s).`,
  heading: `Pre-use check failed: ${data.permitNumber}`,
  tone: "danger",
  blocks: [
    {
      type: "text",
      text: `${data.recordedByName} recorded a pre-use check of permit ${data.permitNumber} ("${data.title}") with items not in order. Do not run the set-up until each is put right and a new check is recorded.`,
    },
    {
      type: "list",
      label: 'Answered "no"',
      items: data.failed.map((item) => (item.note ? `${item.text}: ${item.note}` : item.text)),
    },
    ...(data.note ? [{ type: "quote" as const, label: "Note", text: data.note }] : []),
    { type: "facts", rows: [{ label: "Checked", value: formatInstant(data.checkedAt, ctx.timeZone) }] },
    { type: "action", label: "Open the permit and its checks", url: appLink(ctx, `/permits/${data.permitId}`) },
    { type: "about-figures" },
  ],
  reason:
    data.recipient === "officer"
      ? "You get this e-mail because you are a safety officer in Benchclear."
      : "You get this e-mail because you hold this permit in Benchclear.",
});
