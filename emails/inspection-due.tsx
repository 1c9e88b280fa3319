import { appLink, formatDay, type EmailBuilder } from "./context";

// To the owner of an apparatus: its next inspection is due (lib/upkeep, from the daily job).
export const inspectionDueEmail: EmailBuilder<"inspection_due"> = (data, ctx) => ({
  preheader: `${data.apparatusName}: inspection due ${formatDay(data.dueOn)}.`,
  heading: `Inspection due: ${data.apparatusName}`,
  tone: "warn",
  blocks: [
    {
      type: "text",
      text: `The next inspection of "${data.apparatusName}" was due on ${formatDay(data.dueOn)}. Measure the bleeder, inspect the jars and insulation and check the grounding hook, then record what you found on the apparatus's page.`,
    },
    {
      type: "facts",
      rows: [
        { label: "Room", value: data.room },
        { label: "Interval", value: `${data.intervalDays} days` },
        { label: "Last passed", value: data.lastInspectedOn ? formatDay(data.lastInspectedOn) : "Never inspected" },
      ],
    },
    { type: "action", label: "Open the apparatus", url: appLink(ctx, `/apparatus/${data.apparatusId}`) },
  ],
  reason: "You get this e-mail because you registered this apparatus in Benchclear.",
});
