import { TIER_GLYPH_VIEWBOX, TIER_GLYPHS } from "@/lib/tier-glyph";
import { cx } from "./cx";
import { TIER_CLASSES, type Tier } from "./tier";

// The tier glyph on screen (the drawing is lib/tier-glyph.ts, shared with e-mails and PDFs). It is
// drawn in the tier's swatch colour through currentColor; beside it the words "Tier N · label" are
// always shown, so the glyph is hidden from screen readers unless it is given a title.

export function TierGlyph({ tier, className, title }: { tier: Tier; className?: string; title?: string }) {
  const g = TIER_GLYPHS[tier];
  return (
    <svg
      viewBox={TIER_GLYPH_VIEWBOX}
      className={cx("size-4 shrink-0", TIER_CLASSES[tier].glyph, className)}
      role={title ? "img" : undefined}
      aria-hidden={title ? undefined : true}
      aria-label={title}
      focusable="false"
    >
      {g.ring && <path d={g.ring.d} fill="none" stroke="currentColor" strokeWidth={g.ring.stroke} />}
      {g.solid ? (
        <path d={g.shape} fill="currentColor" />
      ) : (
        <path d={g.shape} fill="none" stroke="currentColor" strokeWidth={g.shapeStroke} strokeLinejoin="round" />
      )}
      <path
        d={g.numeral}
        fill="none"
        stroke={g.solid ? "#ffffff" : "currentColor"}
        strokeWidth={g.numeralStroke}
        strokeLinecap="round"
        strokeLinejoin="round"
      />
    </svg>
  );
}
