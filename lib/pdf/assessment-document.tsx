import type { ReactNode } from "react";
import { Document, Page, Text, View } from "@react-pdf/renderer";
import { citation, formatQuantity, referenceById, TIER_LABELS, type Tier } from "@/lib/hazard";
import {
  DEFAULT_BODY_RESISTANCE_OHM,
  gapLines,
  printAudience,
  printDay,
  printDays,
  printedSource,
  printTime,
  sourceLines,
  tierFigures,
} from "./content";
import { AboutFiguresBox, StatePill, TierBlock, keepUnits, s } from "./parts";
import { TIER_COLOURS } from "@/lib/tier-colours";
import { INK, STATE_LOOK } from "./theme";
import type { PaperSize, PrintData } from "./types";

// The full assessment for the file (issue 18): every figure the engine computed, every reason with
// the threshold it was compared with and its source as publication, edition and clause, every flag,
// every control and condition, and the list of the publications cited — from the same print snapshot
// as the permit (lib/pdf/store.ts), so the two never disagree. Not for the bench: the permit and the
// bench card are.

const PAGE_PADDING = 34;
const FOOTER_SPACE = 70;

function Heading({ children }: { children: string }) {
  return <Text style={[s.h2, { marginTop: 10 }]}>{children}</Text>;
}

/** A table row; the first cell is the label. Widths are fractions of the line. */
function Row({ cells, widths, head = false }: { cells: ReactNode[]; widths: number[]; head?: boolean }) {
  return (
    <View
      wrap={false}
      style={{
        flexDirection: "row",
        paddingVertical: head ? 2 : 2.5,
        borderBottomWidth: head ? 0.75 : 0.5,
        borderBottomColor: head ? INK.rule : INK.hairline,
      }}
    >
      {cells.map((cell, i) => (
        <Text
          key={i}
          style={[
            i > 0 && !head ? s.mono : {},
            {
              width: `${widths[i] * 100}%`,
              paddingRight: 4,
              fontSize: head ? 7.5 : i === 0 ? 9 : 8.5,
              color: head ? INK.muted : INK.text,
              fontWeight: !head && i === 0 ? 700 : 400,
            },
          ]}
        >
          {typeof cell === "string" && head ? cell.toUpperCase() : cell}
        </Text>
      ))}
    </View>
  );
}

const q = (value: number | null | undefined, unit: string) =>
  value === null || value === undefined || !Number.isFinite(value) ? "—" : formatQuantity(value, unit);

export function AssessmentDocument({ data, size }: { data: PrintData; size: PaperSize }) {
  const { permit, assessment: a, setup } = data;
  const tierColours = TIER_COLOURS[permit.tier];
  const body = setup.bodyResistance_ohm ?? DEFAULT_BODY_RESISTANCE_OHM;
  const figures = [
    ...tierFigures(a, setup),
    { label: "Capacitance", value: q(a.capacitance_F, "F"), note: "stored-energy capacitance, all sources" },
    {
      label: "Gap ceiling",
      value: a.gapCeiling_V === null ? "none" : q(a.gapCeiling_V, "V"),
      note: "lowest breakdown's upper bound over the gaps across a source",
    },
    { label: "Time constant", value: q(a.timeConstant_s, "s"), note: "(body + series resistance) × C, largest source" },
    { label: "Specific energy", value: q(a.specificEnergy_A2s, "A²s"), note: "∫i²dt into the body, largest source" },
    { label: "Body model", value: q(body, "Ω"), note: setup.bodyResistance_ohm ? "as given" : "default, hand to hand" },
  ];
  const sources = sourceLines(setup, a);
  const gaps = gapLines(setup.gaps);
  const bleeders = (setup.bleeders ?? []).map(
    (b, i) =>
      `Bleeder ${b.id?.trim() || i + 1}: ${q(b.resistance_ohm, "Ω")} across ${b.across.join(", ") || "nothing"}`,
  );
  const refs = [...new Set([...a.reasons, ...a.flags].map((r) => r.ref).filter((r): r is string => !!r))];
  const tierText = (t: number) => `tier ${t} (${TIER_LABELS[t as Tier] ?? "?"})`;

  return (
    <Document
      title={`Assessment for permit ${permit.number}`}
      author={data.institution.name}
      subject={`Full hazard assessment of ${data.apparatus.name || "the apparatus"} under permit ${permit.number}`}
      creator="Benchclear"
      producer="Benchclear"
      language="en-GB"
      creationDate={new Date(permit.issuedAt)}
    >
      <Page
        size={size === "letter" ? "LETTER" : "A4"}
        style={[s.page, { padding: PAGE_PADDING, paddingBottom: FOOTER_SPACE }]}
      >
        <View
          fixed
          style={{ position: "absolute", top: 0, left: 0, right: 0, height: 6, backgroundColor: tierColours.swatch }}
        />
        <Text style={s.eyebrow}>{data.institution.name} · Full assessment for the file</Text>
        <View style={{ flexDirection: "row", alignItems: "flex-end", marginTop: 2 }}>
          <View style={{ flex: 1 }}>
            <Text style={{ fontSize: 24, fontWeight: 700, color: INK.text }}>{permit.number}</Text>
            <Text style={{ fontSize: 12, color: INK.body }}>{data.event.title}</Text>
          </View>
          <StatePill state={permit.state} size={13} />
        </View>
        <Text style={{ fontSize: 9, color: INK.body, marginTop: 6 }}>
          Apparatus {data.apparatus.name || "—"}
          {data.apparatus.room ? `, ${data.apparatus.room}` : ""} · Holder {data.holderName} · Valid{" "}
          {printDay(permit.validFrom)} – {printDay(permit.validTo)} · Event{" "}
          {printDays(data.event.firstDay, data.event.lastDay)} · Audience{" "}
          {printAudience(data.event.audienceLabel, data.event.audienceSize)}
        </Text>
        <Text style={{ fontSize: 8, color: INK.muted, marginTop: 2 }}>
          Engine {a.engineVersion} · tier rules {a.rulesVersion} · as signed on{" "}
          {printTime(permit.issuedAt, data.institution.timeZone)}
        </Text>

        <View style={{ marginTop: 8 }}>
          <TierBlock tier={permit.tier} label={permit.tierLabel} large={false} />
        </View>

        <Heading>Every figure</Heading>
        <Row head cells={["Figure", "Value", "How"]} widths={[0.28, 0.2, 0.52]} />
        {figures.map((f) => (
          <Row key={f.label} cells={[f.label, f.value, f.note]} widths={[0.28, 0.2, 0.52]} />
        ))}

        <Heading>Each energy source</Heading>
        <Row
          head
          cells={["Source", "As set up", "Voltage", "Charge", "Energy", "Peak current", "Alone"]}
          widths={[0.16, 0.34, 0.1, 0.1, 0.1, 0.1, 0.1]}
        />
        {sources.map((line, i) => {
          const r = a.perSource[i];
          return (
            <Row
              key={`${line.label}-${i}`}
              cells={[
                `${line.label} (${line.kind})`,
                line.detail,
                line.voltage,
                q(r?.charge_C, "C"),
                line.energy,
                q(r?.peakCurrent_A, "A"),
                r ? `tier ${r.tier}` : "—",
              ]}
              widths={[0.16, 0.34, 0.1, 0.1, 0.1, 0.1, 0.1]}
            />
          );
        })}
        {[...gaps, ...bleeders].map((line) => (
          <Text key={line} style={[s.mono, { fontSize: 8.5, color: INK.text, marginTop: 2 }]}>
            {line}
          </Text>
        ))}
        {data.apparatus.notes ? (
          <Text style={{ fontSize: 8.5, color: INK.body, marginTop: 3 }}>Notes: {data.apparatus.notes}</Text>
        ) : null}

        <Heading>Every reason, with its threshold and source</Heading>
        {a.reasons.map((r, i) => (
          <View key={`${r.criterion}-${i}`} wrap={false} style={{ marginBottom: 4 }}>
            <Text style={{ fontSize: 9, color: INK.text }}>
              {i + 1}. {keepUnits(r.meaning)}
            </Text>
            <Text style={[s.mono, { fontSize: 7.5, color: INK.body, marginLeft: 10 }]}>
              {r.criterion}: {q(r.value, r.unit)} against {q(r.threshold, r.unit)} · {tierText(r.tier)}
            </Text>
            <Text style={{ fontSize: 7.5, color: INK.muted, marginLeft: 10 }}>Source: {printedSource(r)}.</Text>
          </View>
        ))}

        {a.flags.length > 0 && <Heading>Also flagged</Heading>}
        {a.flags.map((f, i) => (
          <View key={`${f.code}-${i}`} wrap={false} style={{ marginBottom: 4 }}>
            <Text style={{ fontSize: 9, color: INK.text }}>
              • {keepUnits(f.message)}
              {f.field ? <Text style={{ color: INK.muted }}> (field {f.field})</Text> : null}
            </Text>
            <Text style={{ fontSize: 7.5, color: INK.muted, marginLeft: 10 }}>Source: {printedSource(f)}.</Text>
          </View>
        ))}

        <Heading>Controls and conditions</Heading>
        {data.controls.length === 0 && (
          <Text style={{ fontSize: 9, color: INK.body }}>No controls are required at tier {permit.tier}.</Text>
        )}
        {data.controls.map((c) => (
          <Text key={c.text} style={{ fontSize: 9, color: INK.text, marginBottom: 2 }}>
            {c.confirmed ? "✓ " : "! "}
            {c.text}
            {c.note ? <Text style={{ color: INK.muted }}> — {c.note}</Text> : null}
            {c.confirmed ? " (confirmed by the applicant)" : " (not confirmed)"}
          </Text>
        ))}
        {data.additionalControls ? (
          <Text style={{ fontSize: 9, color: INK.text, marginTop: 2 }}>Also in place: {data.additionalControls}</Text>
        ) : null}
        {permit.conditions.map((c) => (
          <Text key={c} style={{ fontSize: 9, color: INK.text, marginTop: 2 }}>
            Condition of the permit: {c}
          </Text>
        ))}

        <Heading>Publications cited</Heading>
        {refs.length === 0 && (
          <Text style={{ fontSize: 8.5, color: INK.body }}>The sources are named with each reason above.</Text>
        )}
        {refs.map((id) => (
          <View key={id} wrap={false} style={{ marginBottom: 3 }}>
            <Text style={{ fontSize: 8.5, color: INK.text }}>{citation(id)}</Text>
            {referenceById(id)?.note ? (
              <Text style={{ fontSize: 7.5, color: INK.muted, marginLeft: 10 }}>{referenceById(id)!.note}</Text>
            ) : null}
          </View>
        ))}

        <Heading>Signatures</Heading>
        {data.signatures.length === 0 ? (
          <Text style={{ fontSize: 9, color: INK.body }}>Self-certified: no review signatures at this tier.</Text>
        ) : (
          data.signatures.map((sig, i) => (
            <Text key={`${sig.signedAt}-${i}`} style={{ fontSize: 9, color: INK.text }}>
              {sig.name} ({sig.role}): {sig.meaning} — {printTime(sig.signedAt, data.institution.timeZone)}
            </Text>
          ))
        )}

        <View fixed style={{ position: "absolute", left: PAGE_PADDING, right: PAGE_PADDING, bottom: 14 }}>
          <AboutFiguresBox fontSize={8} />
          <View style={{ flexDirection: "row", justifyContent: "space-between", marginTop: 4 }}>
            <Text style={{ fontSize: 7.5, color: INK.muted }}>
              Assessment · {permit.number} · Tier {permit.tier} · {STATE_LOOK[permit.state].label.toLowerCase()}
            </Text>
            <Text
              style={{ fontSize: 7.5, color: INK.muted }}
              render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`}
            />
          </View>
        </View>
      </Page>
    </Document>
  );
}
