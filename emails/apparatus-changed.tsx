import { TIER_LABELS } from "@/lib/hazard";
import type { Tier } from "@/lib/hazard/types";
import type { EmailBlock } from "./components";
import { appLink, type EmailBuilder } from "./context";

// To the holder of each active permit over an apparatus that was just saved as a new revision, and to
// the safety officers: what changed since approval and the new tier. The permit stays as approved;
// the holder may start an amendment, an officer may revoke.

const tierText = (tier: number) => `tier ${tier} (${TIER_LABELS[tier as Tier] ?? "?"})`;

export const apparatusChangedEmail: EmailBuilder<"apparatus_changed"> = (data, ctx) => {
  const holder = data.recipient === "holder";
  const higher = data.permits.some((p) => p.tier > p.permitTier);
  const blocks: EmailBlock[] = [
    {
      type: "text",
      text: `${data.changedByName} saved revision ${data.revision} of "${data.apparatusName}". ${
        data.permits.length === 1 ? "An active permit covers" : `${data.permits.length} active permits cover`
      } this apparatus as it was approved; the permit stays as approved unless a safety officer revokes it.`,
    },
  ];
  for (const p of data.permits) {
    blocks.push({
      type: "facts",
      rows: [
        { label: "Permit", value: `${p.permitNumber}: ${p.title}` },
        { label: "Approved at", value: tierText(p.permitTier), tier: p.permitTier as Tier },
        {
          label: "Now assessed at",
          value: `${tierText(p.tier)}${p.tier > p.permitTier ? " — higher than the permit's" : ""}`,
          tier: p.tier as Tier,
        },
      ],
    });
    if (p.changes.length) blocks.push({ type: "list", label: "What changed since approval", items: p.changes });
    blocks.push({
      type: "action",
      label: `Open permit ${p.permitNumber}`,
      url: appLink(ctx, `/permits/${p.permitId}`),
    });
  }
  blocks.push({
    type: "text",
    text: holder
      ? "If the set-up is to run as it is now, start an amendment from the permit page: a new application with the changed apparatus, through the normal review. Until it is approved, run the set-up only as the permit describes it."
      : "Review the change on the permit page; revoke the permit there if the set-up must not run as approved.",
  });
  blocks.push({ type: "about-figures" });
  return {
    preheader: `${data.apparatusName} changed${higher ? " to a higher tier" : ""}: revision ${data.revision}.`,
    heading: "Apparatus changed since approval",
    tone: higher ? "danger" : "warn",
    blocks,
    reason: holder
      ? "You get this e-mail because you hold a permit that covers this apparatus."
      : "You get this e-mail because you are a safety officer in Benchclear.",
  };
};
