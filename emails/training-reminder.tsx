import { appLink, formatDay, type EmailBuilder } from "./context";

// Before a course of a person's training lapses (30 and 7 days ahead): to the person, and to the
// safety officers, who record the refresher. Sent once per person, course, lapse day and threshold
// (lib/training/reminders.ts).
export const trainingReminderEmail: EmailBuilder<"training_reminder"> = (data, ctx) => {
  const lapses = formatDay(data.lapsesOn);
  const forPerson = data.recipient === "person";
  return {
    preheader: `${data.course} lapses on ${lapses}.`,
    heading: forPerson ? `Your ${data.course} training lapses soon` : `${data.personName}'s training lapses soon`,
    tone: data.daysLeft <= 7 ? "warn" : "info",
    blocks: [
      {
        type: "text",
        text: forPerson
          ? `Your ${data.course} course counts until the day before ${lapses}. From that day you may not be named as an operator on a permit that requires it, and permits naming you are flagged. Book the refresher now; a safety officer records it once you have taken it.`
          : `${data.personName}'s ${data.course} course counts until the day before ${lapses}. Permits naming them as an operator are flagged from then on; record the refresher on the Training page once it is taken.`,
      },
      {
        type: "facts",
        rows: [
          { label: "Course", value: data.course },
          { label: "Lapses on", value: lapses },
          { label: "Days left", value: String(data.daysLeft) },
        ],
      },
      {
        type: "action",
        label: forPerson ? "See your training" : "Open Training",
        url: appLink(ctx, forPerson ? "/account" : "/training"),
      },
    ],
    reason: forPerson
      ? "You get this e-mail because your training is recorded in Benchclear."
      : "You get this e-mail because you are a safety officer in Benchclear.",
  };
};
