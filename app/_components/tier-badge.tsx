import { cx } from "./cx";
import { TIER_CLASSES, TIER_LABELS, type Tier } from "./tier";
import { TierGlyph } from "./tier-glyph";

type TierBadgeProps = {
  tier: Tier;
  /** Optional count shown after the label, e.g. applications waiting at this tier. */
  count?: number | string;
  /** What the count counts, for screen readers ("3 applications"). */
  countNoun?: string;
  size?: "sm" | "md";
  className?: string;
};

// The tier in colour, as its glyph (the numeral in a shape that gains sides and weight with the tier)
// and in words. The glyph is a second cue that does not depend on colour; the words are the one
// that counts.
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
      <TierGlyph tier={tier} className={size === "sm" ? "size-3.5" : "size-4"} />
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
