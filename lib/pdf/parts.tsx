import { Image, Path, StyleSheet, Svg, Text, View } from "@react-pdf/renderer";
import { ABOUT_FIGURES_POINTS, ABOUT_FIGURES_TITLE, INFO_SYMBOL } from "@/lib/about-figures";
import type { PermitState } from "@/db/schema/permits";
import type { EmergencyContact } from "@/db/schema/settings";
import type { Tier } from "@/lib/hazard";
import { hazardHeader, SAFETY_ALERT_SYMBOL } from "@/lib/signal-word";
import { TIER_GLYPH_VIEWBOX, TIER_GLYPHS } from "@/lib/tier-glyph";
import { printDay } from "./content";
import { MONO, SANS } from "./fonts";
import { TIER_COLOURS } from "@/lib/tier-colours";
import { INK, STATE_LOOK } from "./theme";

// Pieces the permit and the bench card share. Sizes are in points (1/72 in); the smallest text that
// matters at the bench is 10 pt, the number and state are read from a step away.

/** Keeps a figure on one line with its unit ("60 V", "5.12 s"): a unit alone at a line's start misreads. */
export function keepUnits(text: string): string {
  return text.replace(/(\d) (?=[A-Za-zµΩ°%])/g, "$1\u00a0");
}

export const s = StyleSheet.create({
  page: { fontFamily: SANS, fontSize: 10, color: INK.body },
  eyebrow: { fontSize: 8, fontWeight: 700, letterSpacing: 1.2, color: INK.muted, textTransform: "uppercase" },
  h2: {
    fontSize: 9,
    fontWeight: 700,
    letterSpacing: 1.1,
    color: INK.accent,
    textTransform: "uppercase",
    marginBottom: 5,
  },
  mono: { fontFamily: MONO },
  rule: { borderBottomWidth: 0.75, borderBottomColor: INK.rule },
});

export function StatePill({ state, size = 16 }: { state: PermitState; size?: number }) {
  const look = STATE_LOOK[state];
  return (
    <View
      style={{
        backgroundColor: look.colour,
        borderRadius: 4,
        paddingVertical: size * 0.22,
        paddingHorizontal: size * 0.6,
        alignSelf: "flex-start",
      }}
    >
      <Text style={{ color: "#ffffff", fontSize: size, fontWeight: 700, letterSpacing: size * 0.08 }}>
        {look.label}
      </Text>
    </View>
  );
}

/** The tier glyph (lib/tier-glyph.ts, the same drawing as on screen and in e-mails), `size` points square. */
export function TierGlyph({ tier, size = 22 }: { tier: Tier; size?: number }) {
  const g = TIER_GLYPHS[tier];
  const colour = TIER_COLOURS[tier].swatch;
  return (
    <Svg viewBox={TIER_GLYPH_VIEWBOX} style={{ width: size, height: size }}>
      {g.ring && <Path d={g.ring.d} fill="none" stroke={colour} strokeWidth={g.ring.stroke} />}
      {g.solid ? (
        <Path d={g.shape} fill={colour} />
      ) : (
        <Path d={g.shape} fill="none" stroke={colour} strokeWidth={g.shapeStroke} strokeLinejoin="round" />
      )}
      <Path
        d={g.numeral}
        fill="none"
        stroke={g.solid ? "#ffffff" : colour}
        strokeWidth={g.numeralStroke}
        strokeLinecap="round"
        strokeLinejoin="round"
      />
    </Svg>
  );
}

export function TierBlock({
  tier,
  label,
  detail,
  large = true,
}: {
  tier: Tier;
  label: string;
  detail?: string[];
  large?: boolean;
}) {
  const c = TIER_COLOURS[tier];
  return (
    <View
      style={{
        backgroundColor: c.tint,
        borderColor: c.border,
        borderWidth: 0.75,
        borderLeftWidth: 8,
        borderLeftColor: c.swatch,
        borderRadius: 3,
        paddingVertical: large ? 8 : 6,
        paddingHorizontal: 10,
      }}
    >
      <View style={{ flexDirection: "row", alignItems: "center" }}>
        <TierGlyph tier={tier} size={large ? 24 : 18} />
        <Text style={{ marginLeft: 6, fontSize: large ? 22 : 16, fontWeight: 700, color: c.text }}>Tier {tier}</Text>
        <Text style={{ marginLeft: 8, fontSize: large ? 18 : 13, color: c.text }}>· {label}</Text>
      </View>
      {detail?.map((line) => (
        <Text key={line} style={{ marginTop: 4, fontSize: 8.5, color: c.text }}>
          {keepUnits(line)}
        </Text>
      ))}
    </View>
  );
}

export function QrBlock({ dataUrl, size, caption }: { dataUrl: string; size: number; caption: string }) {
  return (
    <View style={{ width: size, alignItems: "center" }}>
      {/* react-pdf's Image has no alt text: the caption and the printed URL carry the meaning. */}
      {/* eslint-disable-next-line jsx-a11y/alt-text */}
      <Image src={dataUrl} style={{ width: size, height: size }} />
      <Text style={{ fontSize: 8, color: INK.muted, textAlign: "center", marginTop: 2 }}>{caption}</Text>
    </View>
  );
}

export function EmergencyContacts({ contacts, phoneSize = 15 }: { contacts: EmergencyContact[]; phoneSize?: number }) {
  if (contacts.length === 0) {
    return (
      <Text style={{ fontSize: 10, color: INK.body }}>
        No emergency contacts are configured: ask your safety office and write them here.
      </Text>
    );
  }
  return (
    <View>
      {contacts.map((c, i) => (
        <View key={`${c.label}-${i}`} style={{ marginBottom: 5 }}>
          <Text style={{ fontSize: 9, color: INK.muted }}>{c.label}</Text>
          <Text style={{ fontSize: phoneSize, fontWeight: 700, color: INK.text }}>{c.phone}</Text>
        </View>
      ))}
    </View>
  );
}

export function NumberedSteps({ steps, fontSize = 11 }: { steps: string[]; fontSize?: number }) {
  return (
    <View>
      {steps.map((step, i) => (
        <View key={step} style={{ flexDirection: "row", marginBottom: fontSize * 0.35 }} wrap={false}>
          <View
            style={{
              width: fontSize * 1.55,
              height: fontSize * 1.55,
              borderRadius: fontSize,
              backgroundColor: INK.accent,
              alignItems: "center",
              justifyContent: "center",
              marginRight: 7,
            }}
          >
            <Text style={{ color: "#ffffff", fontSize: fontSize * 0.85, fontWeight: 700, lineHeight: 1 }}>{i + 1}</Text>
          </View>
          <Text style={{ flex: 1, fontSize, color: INK.text, paddingTop: fontSize * 0.12 }}>{keepUnits(step)}</Text>
        </View>
      ))}
    </View>
  );
}

/** The deferral note (lib/about-figures.ts) with its information symbol: a note, never a hazard sign. */
export function AboutFiguresBox({ fontSize = 9 }: { fontSize?: number }) {
  const icon = fontSize * 1.35;
  return (
    <View
      wrap={false}
      style={{
        flexDirection: "row",
        borderWidth: 0.75,
        borderColor: INK.rule,
        borderLeftWidth: 4,
        borderLeftColor: INK.accent,
        backgroundColor: "#ffffff",
        paddingVertical: 6,
        paddingHorizontal: 9,
      }}
    >
      <Svg viewBox={INFO_SYMBOL.viewBox} style={{ width: icon, height: icon, marginRight: 6 }}>
        <Path d={INFO_SYMBOL.ring} fill="none" stroke={INK.accent} strokeWidth={INFO_SYMBOL.stroke} />
        <Path
          d={INFO_SYMBOL.stem}
          fill="none"
          stroke={INK.accent}
          strokeWidth={INFO_SYMBOL.stroke * 1.2}
          strokeLinecap="round"
        />
        <Path d={INFO_SYMBOL.dot} fill={INK.accent} />
      </Svg>
      <Text style={{ flex: 1, fontSize, color: INK.body }}>
        <Text style={{ fontWeight: 700, color: INK.text }}>{ABOUT_FIGURES_TITLE}. </Text>
        {ABOUT_FIGURES_POINTS[0]} {ABOUT_FIGURES_POINTS[1]}{" "}
        <Text style={{ fontWeight: 700, color: INK.text }}>{ABOUT_FIGURES_POINTS[2]}</Text>
      </Text>
    </View>
  );
}

/**
 * The hazard header (lib/signal-word.ts): the safety alert symbol and the signal word on the
 * standard's colour, then the hazard, what it does and how to avoid it. Nothing for tier 0.
 */
export function HazardHeader({ tier, wordSize = 22 }: { tier: Tier; wordSize?: number }) {
  const header = hazardHeader(tier);
  if (!header) return null;
  const symbol = wordSize * 1.05;
  return (
    <View wrap={false} style={{ borderWidth: 1.5, borderColor: "#000000", borderRadius: 2 }}>
      <View
        style={{
          flexDirection: "row",
          alignItems: "center",
          justifyContent: "center",
          backgroundColor: header.panel,
          paddingVertical: wordSize * 0.22,
        }}
      >
        <Svg
          viewBox={SAFETY_ALERT_SYMBOL.viewBox}
          style={{ width: symbol, height: symbol, marginRight: wordSize * 0.35 }}
        >
          <Path d={SAFETY_ALERT_SYMBOL.triangle} fill={header.ink} />
          <Path d={SAFETY_ALERT_SYMBOL.bar} fill={header.panel} />
          <Path d={SAFETY_ALERT_SYMBOL.dot} fill={header.panel} />
        </Svg>
        <Text style={{ fontSize: wordSize, fontWeight: 700, color: header.ink, letterSpacing: wordSize * 0.08 }}>
          {header.word}
        </Text>
      </View>
      <Text
        style={{
          backgroundColor: "#ffffff",
          color: "#000000",
          fontSize: wordSize * 0.5,
          fontWeight: 700,
          paddingVertical: wordSize * 0.22,
          paddingHorizontal: wordSize * 0.4,
          textAlign: "center",
        }}
      >
        {header.message}
      </Text>
    </View>
  );
}

/** The state written across every page of a permit that no longer allows the set-up to run. */
export function Overprint({ state }: { state: PermitState }) {
  if (state === "active") return null;
  const look = STATE_LOOK[state];
  return (
    <View
      fixed
      style={{
        position: "absolute",
        top: 0,
        left: 0,
        right: 0,
        bottom: 0,
        alignItems: "center",
        justifyContent: "center",
      }}
    >
      <Text
        style={{
          fontSize: 120,
          fontWeight: 700,
          color: look.colour,
          opacity: 0.16,
          letterSpacing: 6,
          transform: "rotate(-35deg)",
        }}
      >
        {look.label}
      </Text>
    </View>
  );
}

/** The banner under the header of a permit that is no longer active: when and why, in words. */
export function EndedBanner({
  state,
  validTo,
  revokedOn,
  revokedReason,
}: {
  state: PermitState;
  validTo: string;
  revokedOn: string | null;
  revokedReason: string | null;
}) {
  if (state === "active") return null;
  const look = STATE_LOOK[state];
  const when =
    state === "revoked"
      ? `Revoked${revokedOn ? ` on ${printDay(revokedOn)}` : ""}${revokedReason ? `: ${revokedReason}` : "."}`
      : `Expired: the last valid day was ${printDay(validTo)}.`;
  return (
    <View
      style={{ backgroundColor: look.colour, paddingVertical: 6, paddingHorizontal: 10, borderRadius: 3, marginTop: 8 }}
    >
      <Text style={{ color: "#ffffff", fontSize: 12, fontWeight: 700 }}>
        {look.label}: {look.meaning}
      </Text>
      <Text style={{ color: "#ffffff", fontSize: 10, marginTop: 2 }}>{when}</Text>
    </View>
  );
}
