import type { Tier } from "@/lib/hazard/types";

// Benchclear's tier glyph: the tier numeral inside a shape that gains sides and weight as the hazard
// rises — tier 0 a thin circle, 1 a square, 2 a heavy pentagon, 3 a solid hexagon, 4 a solid
// heptagon inside a ring. Shape, weight and numeral each tell the tier without colour; the colour is
// the tier's own swatch. This file is the one drawing: the screen (app/_components/tier-glyph.tsx),
// the e-mails (emails/components.tsx) and the PDFs (lib/pdf/parts.tsx) draw these paths, in a
// 24 × 24 box (units of the viewBox; at 12 px one unit is half a pixel).

export const TIER_GLYPH_VIEWBOX = "0 0 24 24";

export type TierGlyphDrawing = {
  /** The outline of the shape. */
  shape: string;
  /** Solid shapes (tiers 3–4) are filled with the tier colour and carry a white numeral. */
  solid: boolean;
  /** Stroke width of an outlined shape, in viewBox units. */
  shapeStroke: number;
  /** Tier 4's outer ring, drawn as a stroke. */
  ring?: { d: string; stroke: number };
  /** The numeral, drawn as a stroke with round caps and joins. */
  numeral: string;
  numeralStroke: number;
};

const CENTRE = 12;

/** A regular polygon as path data: `sides` corners on a circle of `radius`, the first at `startDeg`. */
function polygon(sides: number, radius: number, startDeg: number, cy = CENTRE): string {
  const points = Array.from({ length: sides }, (_, i) => {
    const a = ((startDeg + (360 * i) / sides) * Math.PI) / 180;
    return `${(CENTRE + radius * Math.cos(a)).toFixed(2)} ${(cy + radius * Math.sin(a)).toFixed(2)}`;
  });
  return `M${points.join("L")}Z`;
}

function circle(radius: number): string {
  return `M${CENTRE - radius} ${CENTRE}a${radius} ${radius} 0 1 0 ${2 * radius} 0a${radius} ${radius} 0 1 0 ${-2 * radius} 0Z`;
}

// Numerals as strokes, 10.8 units tall (y 6.6 to 17.4) and about 7 wide, so they need no font: mail
// clients and the PDF renderer draw them the same way.
const NUMERALS: Record<Tier, string> = {
  0: "M12 6.6C14.52 6.6 15.6 9.12 15.6 12S14.52 17.4 12 17.4 8.4 14.88 8.4 12 9.48 6.6 12 6.6Z",
  1: "M9.12 9.12 12.48 6.6V17.4M9.12 17.4H15.6",
  2: "M8.76 9.24C9.12 7.56 10.32 6.6 12 6.6 13.92 6.6 15.24 7.8 15.24 9.48 15.24 10.92 14.4 11.88 13.08 13.08L8.64 17.4H15.6",
  3: "M8.88 7.56C9.6 6.96 10.68 6.6 12 6.6 13.92 6.6 15.12 7.68 15.12 9.24S13.92 11.88 12 11.88H10.92M12 11.88C14.16 11.88 15.6 12.96 15.6 14.64S14.04 17.4 12 17.4C10.68 17.4 9.48 17.04 8.64 16.32",
  4: "M14.04 17.4V6.6L8.16 14.16H16.08",
};

export const TIER_GLYPHS: Record<Tier, TierGlyphDrawing> = {
  0: { shape: circle(10), solid: false, shapeStroke: 1.4, numeral: NUMERALS[0], numeralStroke: 1.9 },
  1: {
    shape: polygon(4, 12.3, 45), // a square standing on a side, 17.4 units across
    solid: false,
    shapeStroke: 1.9,
    numeral: NUMERALS[1],
    numeralStroke: 2.1,
  },
  2: {
    shape: polygon(5, 10.8, -90, 12.9), // point up, centred a little low so the numeral sits inside
    solid: false,
    shapeStroke: 2.7,
    numeral: NUMERALS[2],
    numeralStroke: 2.3,
  },
  3: { shape: polygon(6, 11, 0), solid: true, shapeStroke: 0, numeral: NUMERALS[3], numeralStroke: 2.3 },
  4: {
    shape: polygon(7, 9.1, -90),
    solid: true,
    shapeStroke: 0,
    ring: { d: circle(11.1), stroke: 1.5 },
    numeral: NUMERALS[4],
    numeralStroke: 2.3,
  },
};
