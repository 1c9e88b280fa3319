import { appLink, formatDay, tierFact, type EmailBuilder } from "./context";

// To the permit holder: the application is approved and the permit is issued. The permit PDF and a
// calendar file with the validity window are attached (lib/mail/compose.ts); the bench card is linked in
// both paper sizes (issue 20, item 4: nothing led to it).
export const applicationApprovedEmail: EmailBuilder<"application_approved"> = (data, ctx) => ({
  preheader: `Permit ${data.permitNumber} is valid from ${formatDay(data.validFrom)} to ${formatDay(data.validTo)}.`,
  heading: `Permit ${data.permitNumber} issued`,
  tone: "success",
  blocks: [
    {
      type: "text",
      text: `Your application "${data.title}" is approved${data.signerName ? ` by ${data.signerName}` : ""}. Print the attached permit and post it at the bench; its QR code opens the live status page.`,
    },
    {
      type: "facts",
      rows: [
        { label: "Permit", value: data.permitNumber },
        { label: "Application", value: data.title },
        { label: "Valid from", value: formatDay(data.validFrom) },
        { label: "Valid until", value: `${formatDay(data.validTo)} (the end of that day)` },
        ...(typeof data.tier === "number" ? [tierFact(data.tier)] : []),
        ...(data.room ? [{ label: "Room", value: data.room }] : []),
      ],
    },
    ...(data.conditions && data.conditions.length > 0
      ? [{ type: "list" as const, label: "Conditions of this permit", items: data.conditions }]
      : []),
    { type: "action", label: "Open the permit", url: appLink(ctx, `/permits/${data.permitId}`) },
    {
      type: "text",
      text: "Fix the bench card beside the apparatus: it carries the hazard, the discharge steps and the emergency contacts for the people at the bench.",
    },
    { type: "action", label: "Bench card (A4)", url: appLink(ctx, `/permits/${data.permitId}/bench-card`) },
    {
      type: "action",
      label: "Bench card (US Letter)",
      url: appLink(ctx, `/permits/${data.permitId}/bench-card?size=letter`),
    },
    {
      type: "text",
      text: "The attached calendar file adds the validity window to your calendar. Benchclear reminds you before the permit ends.",
    },
    { type: "about-figures" },
  ],
  reason: "You get this e-mail because you hold this permit in Benchclear.",
});
