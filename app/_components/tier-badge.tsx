import { cx } from "./cx";
import { TIER_CLASSES, TIER_LABELS, type Tier } from "./tier";

type TierBadgeProps = {
  tier: Tier;
  /** Optional count shown after the label, e.g. applications waiting at this tier. */
  count?: number;
  /** What the count counts, for screen readers ("3 applications"). */
  countNoun?: string;
  size?: "sm" | "md";
  className?: string;
};

// The tier in colour, as a small meter (tier N fills N of four bars) and in words. The meter is a
// second cue that does not depend on colour; the words are the one that counts.
export function TierBadge({ tier, count, countNoun = "applications", size = "md", className }: TierBadgeProps) {
  const c = TIER_CLASSES[tier];
  return (
    <span
      className={cx(
        "inline-flex max-w-full items-center gap-1.5 rounded-md border font-medium whitespace-nowrap",
        size === "sm" ? "px-1.5 py-px text-xs leading-5" : "px-2 py-0.5 text-sm leading-5",
        c.tint,
        c.border,
        c.text,
        className,
      )}
    >
      <TierMeter tier={tier} />
      <span>
        Tier {tier} · {TIER_LABELS[tier]}
      </span>
      {count !== undefined && (
        <span className="figure ml-0.5 rounded bg-white/80 px-1 text-stone-900 tabular-nums">
          <span className="sr-only">: </span>
          {count}
          <span className="sr-only"> {countNoun}</span>
        </span>
      )}
    </span>
  );
}

const BAR_HEIGHTS = ["h-1.5", "h-2", "h-2.5", "h-3"] as const;

export function TierMeter({ tier, className }: { tier: Tier; className?: string }) {
  const c = TIER_CLASSES[tier];
  return (
    <span aria-hidden="true" className={cx("inline-flex h-3 items-end gap-px", className)}>
      {BAR_HEIGHTS.map((h, i) => (
        <span key={h} className={cx("w-[3px] rounded-[1px]", h, i < tier ? c.swatch : "bg-current opacity-25")} />
      ))}
    </span>
  );
}
