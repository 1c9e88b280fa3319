import { describe, expect, it } from "vitest";
import type { Tier } from "@/lib/hazard/types";
import { TIER_GLYPHS } from "@/lib/tier-glyph";

// The tier glyph must read as severity without colour (product.md: "never colour alone"; issue 13:
// "the tier numeral inside a shape that changes with the tier"): each tier has its own shape, the
// shapes gain corners and weight as the tier rises, and each carries its own numeral.

const TIERS: Tier[] = [0, 1, 2, 3, 4];

/** Corners of a polygon path (M x y L x y … Z); a circle drawn with arcs has none. */
function corners(d: string): number {
  return d.includes("a") ? 0 : (d.match(/L/g)?.length ?? 0) + 1;
}

/** Ink weight: 0–1 for an outline (its stroke width in 24ths of the box), 2 for a solid shape, 3 with a ring. */
function weight(tier: Tier): number {
  const g = TIER_GLYPHS[tier];
  if (g.solid) return g.ring ? 3 : 2;
  return g.shapeStroke / 24;
}

describe("the tier glyph", () => {
  it("gives every tier its own shape and numeral", () => {
    expect(new Set(TIERS.map((t) => TIER_GLYPHS[t].shape)).size).toBe(5);
    expect(new Set(TIERS.map((t) => TIER_GLYPHS[t].numeral)).size).toBe(5);
  });

  it("gains corners and weight as the tier rises: circle, square, pentagon, solid hexagon, solid heptagon in a ring", () => {
    expect(TIERS.map((t) => corners(TIER_GLYPHS[t].shape))).toEqual([0, 4, 5, 6, 7]);
    for (const t of [1, 2, 3, 4] as const) expect(weight(t)).toBeGreaterThan(weight((t - 1) as Tier));
    expect(TIER_GLYPHS[4].ring).toBeDefined();
  });

  it("keeps every point inside its 24 × 24 box, strokes included", () => {
    for (const t of TIERS) {
      const g = TIER_GLYPHS[t];
      const numbers = (d: string) => (d.match(/-?\d*\.?\d+/g) ?? []).map(Number);
      // Polygons and the numeral use absolute coordinates only; the circles' arcs are checked by radius.
      for (const d of [g.numeral, ...(corners(g.shape) ? [g.shape] : [])]) {
        for (const n of numbers(d)) {
          expect(n - g.shapeStroke / 2, `tier ${t}`).toBeGreaterThanOrEqual(0);
          expect(n + g.shapeStroke / 2, `tier ${t}`).toBeLessThanOrEqual(24);
        }
      }
    }
  });
});
