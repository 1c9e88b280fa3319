import { appLink, formatDay, type EmailBuilder } from "./context";

// Reminders before a permit ends (to the holder) and on the day after its last valid day (to the
// holder, and to the reviewer who signed it). Sent by the daily reminder job, once per permit,
// reminder and due date (lib/jobs/actions.ts).
export const permitReminderEmail: EmailBuilder<"permit_reminder"> = (data, ctx) => {
  const expired = data.daysLeft <= 0;
  const lastDay = formatDay(data.validTo);
  const permitUrl = appLink(ctx, `/permits/${data.permitId}`);
  const forReviewer = data.recipient === "reviewer";
  if (expired) {
    return {
      preheader: `Permit ${data.permitNumber} ended on ${lastDay}.`,
      heading: `Permit ${data.permitNumber} has expired`,
      tone: "danger",
      blocks: [
        {
          type: "text",
          text: forReviewer
            ? `Permit ${data.permitNumber} for "${data.title}"${data.holderName ? `, held by ${data.holderName},` : ""} ended with its last valid day, ${lastDay}. The set-up may not be run under it any more.`
            : `Your permit ${data.permitNumber} for "${data.title}" ended with its last valid day, ${lastDay}. The set-up may not be run under it any more. To keep running it, renew the permit: start a renewal from the permit page and submit it for review.`,
        },
        {
          type: "facts",
          rows: [
            { label: "Permit", value: data.permitNumber },
            { label: "Last valid day", value: lastDay },
          ],
        },
        { type: "action", label: "Open the permit", url: permitUrl },
        { type: "about-figures" },
      ],
      reason: forReviewer
        ? "You get this e-mail because you signed the review of this permit's application in Benchclear."
        : "You get this e-mail because you hold this permit in Benchclear.",
    };
  }
  const left = data.daysLeft === 1 ? "Today is its last valid day" : `${data.daysLeft} days left, today included`;
  return {
    preheader: `Permit ${data.permitNumber}: last valid day ${lastDay}.`,
    heading:
      data.daysLeft === 1
        ? `Permit ${data.permitNumber}: last valid day today`
        : `Permit ${data.permitNumber} ends soon`,
    tone: data.daysLeft <= 7 ? "warn" : "info",
    blocks: [
      {
        type: "text",
        text: `Your permit ${data.permitNumber} for "${data.title}" is valid until the end of ${lastDay}. ${left}. If the set-up will run after that, renew the permit now: a renewal goes through review again and takes time.`,
      },
      {
        type: "facts",
        rows: [
          { label: "Permit", value: data.permitNumber },
          { label: "Last valid day", value: lastDay },
          { label: "Days left", value: String(data.daysLeft) },
        ],
      },
      { type: "action", label: "Open the permit", url: permitUrl },
    ],
    reason: "You get this e-mail because you hold this permit in Benchclear. Reminders stop once you renew it.",
  };
};
