import { appLink, formatInstant, type EmailBuilder } from "./context";

// To the holder and the operators named on the permit: the permit no longer allows the set-up to run.
export const permitRevokedEmail: EmailBuilder<"permit_revoked"> = (data, ctx) => ({
  preheader: `Permit ${data.permitNumber} is revoked: stop using the set-up under it.`,
  heading: `Permit ${data.permitNumber} revoked`,
  tone: "danger",
  blocks: [
    {
      type: "text",
      text: `${data.signerName} revoked permit ${data.permitNumber} for "${data.title}". From now on the set-up may not be run under this permit. Take the posted permit down from the bench.`,
    },
    { type: "quote", label: "Reason", text: data.reason || "(no reason given)" },
    ...(data.revokedAt
      ? [{ type: "facts" as const, rows: [{ label: "Revoked", value: formatInstant(data.revokedAt, ctx.timeZone) }] }]
      : []),
    { type: "action", label: "Open the permit", url: appLink(ctx, `/permits/${data.permitId}`) },
    { type: "about-figures" },
  ],
  reason:
    ctx.recipient.relation === "holder"
      ? "You get this e-mail because you hold this permit in Benchclear."
      : "You get this e-mail because you are named on this permit's application (as an operator or the responsible person).",
});
