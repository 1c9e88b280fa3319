import type { ReactNode } from "react";
import { Document, Page, Text, View } from "@react-pdf/renderer";
import {
  dischargeSteps,
  decidingReasons,
  figureReasons,
  gapLines,
  printAudience,
  printDay,
  printDays,
  printTime,
  printedFlags,
  sourceLines,
  tierFigures,
  type PrintedFinding,
  type SourceLine,
} from "./content";
import {
  AboutFiguresBox,
  EmergencyContacts,
  EndedBanner,
  HazardHeader,
  NumberedSteps,
  Overprint,
  QrBlock,
  StatePill,
  TierBlock,
  keepUnits,
  s,
} from "./parts";
import { TIER_COLOURS } from "@/lib/tier-colours";
import { INK, STATE_LOOK } from "./theme";
import type { PaperSize, PrintData } from "./types";

// The permit as printed for the bench: Benchclear's own layout. The first screenful answers "may this
// run, who is responsible, how bad is it, what do I do before touching it, whom do I call"; the
// details (sources, controls, signatures) follow. Large type for what is read from a step away.

const PAGE_PADDING = 30;
/** Room kept free at the foot of every page for the note about the figures and the page line (points). */
const FOOTER_SPACE = 76;

function Label({ children }: { children: string }) {
  return (
    <Text style={{ fontSize: 8, color: INK.muted, letterSpacing: 0.4, textTransform: "uppercase" }}>{children}</Text>
  );
}

function Fact({ label, value, flex = 1 }: { label: string; value: string; flex?: number }) {
  return (
    <View style={{ flex, paddingRight: 8 }}>
      <Label>{label}</Label>
      <Text style={{ fontSize: 12, fontWeight: 700, color: INK.text, marginTop: 1 }}>{value}</Text>
    </View>
  );
}

/** A finding in small type with the publication and clause it rests on underneath. */
function Finding({ finding, fontSize = 8.5 }: { finding: PrintedFinding; fontSize?: number }) {
  return (
    <Text style={{ fontSize, color: INK.body, marginBottom: 2.5 }}>
      • {keepUnits(finding.text)}
      {finding.source ? (
        <Text style={{ fontSize: fontSize - 1, color: INK.muted }}> Source: {finding.source}.</Text>
      ) : null}
    </Text>
  );
}

/** A titled block. `lead` is kept on the same page as the title, so no heading is left alone at a page's foot. */
function Section({
  title,
  lead,
  children,
  wrap = true,
}: {
  title: string;
  lead?: ReactNode;
  children?: ReactNode;
  wrap?: boolean;
}) {
  return (
    <View style={{ marginTop: 6 }} wrap={wrap}>
      <View wrap={false}>
        <Text style={s.h2}>{title}</Text>
        {lead}
      </View>
      {children}
    </View>
  );
}

export function PermitDocument({ data, size, qr }: { data: PrintData; size: PaperSize; qr: string }) {
  const { permit, assessment, setup } = data;
  const tierColours = TIER_COLOURS[permit.tier];
  const figures = tierFigures(assessment, setup);
  const sources = sourceLines(setup, assessment);
  const gaps = gapLines(setup.gaps);
  const operators = data.event.operators.map((o) => (o.trained ? `${o.name} (trained)` : o.name));
  const stateLook = STATE_LOOK[permit.state];
  const reasons = decidingReasons(assessment);
  const gapReasons = figureReasons(assessment);
  const otherReasons = [...reasons.slice(1), ...gapReasons];
  const flags = printedFlags(assessment);
  const conditionsBox =
    permit.conditions.length > 0 ? (
      <View
        style={{
          backgroundColor: INK.panel,
          padding: 7,
          marginBottom: 6,
          borderLeftWidth: 3,
          borderLeftColor: INK.accent,
        }}
        wrap={false}
      >
        <Text style={{ fontSize: 9, fontWeight: 700, color: INK.accent, marginBottom: 2 }}>
          Conditions of this permit
        </Text>
        {permit.conditions.map((c) => (
          <Text key={c} style={{ fontSize: 10.5, color: INK.text }}>
            • {c}
          </Text>
        ))}
      </View>
    ) : null;
  const controlsGrid = (
    <View style={{ flexDirection: "row", flexWrap: "wrap" }}>
      {data.controls.map((c) => (
        <View
          key={c.text}
          style={{ width: "50%", flexDirection: "row", paddingRight: 8, marginBottom: 2.5 }}
          wrap={false}
        >
          <Text style={{ width: 12, fontSize: 10, fontWeight: 700, color: c.confirmed ? "#047857" : "#9a3412" }}>
            {c.confirmed ? "✓" : "!"}
          </Text>
          <Text style={{ flex: 1, fontSize: 9.5, color: INK.text }}>
            {c.text}
            {c.note ? <Text style={{ color: INK.muted }}> — {c.note}</Text> : null}
            {c.confirmed ? "" : " (not confirmed)"}
          </Text>
        </View>
      ))}
    </View>
  );
  const sourceRow = (line: SourceLine, i: number) => (
    <View
      key={`${line.label}-${i}`}
      wrap={false}
      style={{
        flexDirection: "row",
        paddingVertical: 3,
        borderBottomWidth: 0.5,
        borderBottomColor: INK.hairline,
      }}
    >
      <Text style={{ width: "22%", fontSize: 10, fontWeight: 700, color: INK.text, paddingRight: 4 }}>
        {line.label}
      </Text>
      <Text style={{ width: "16%", fontSize: 9.5, color: INK.body, paddingRight: 4 }}>{line.kind}</Text>
      <Text style={[s.mono, { width: "48%", fontSize: 8.5, color: INK.text, paddingRight: 4 }]}>{line.detail}</Text>
      <Text style={[s.mono, { width: "14%", fontSize: 9.5, color: INK.text, textAlign: "right" }]}>{line.energy}</Text>
    </View>
  );
  const sourcesHeader = (
    <View style={{ flexDirection: "row", paddingBottom: 2, ...s.rule }}>
      <Text style={{ width: "22%", fontSize: 8, color: INK.muted }}>SOURCE</Text>
      <Text style={{ width: "16%", fontSize: 8, color: INK.muted }}>KIND</Text>
      <Text style={{ width: "48%", fontSize: 8, color: INK.muted }}>AS SET UP</Text>
      <Text style={{ width: "14%", fontSize: 8, color: INK.muted, textAlign: "right" }}>STORES</Text>
    </View>
  );

  return (
    <Document
      title={`Permit ${permit.number}`}
      author={data.institution.name}
      subject={`High-voltage permit ${permit.number}: ${data.event.title}`}
      creator="Benchclear"
      producer="Benchclear"
      language="en-GB"
      creationDate={new Date(permit.issuedAt)}
    >
      <Page
        size={size === "letter" ? "LETTER" : "A4"}
        style={[s.page, { padding: PAGE_PADDING, paddingBottom: FOOTER_SPACE }]}
      >
        {/* Tier colour along the top edge of every page. */}
        <View
          fixed
          style={{ position: "absolute", top: 0, left: 0, right: 0, height: 7, backgroundColor: tierColours.swatch }}
        />

        {/* The hazard header (DANGER, WARNING or CAUTION by tier; none for tier 0) opens the permit. */}
        {permit.tier > 0 && (
          <View style={{ marginBottom: 10 }}>
            <HazardHeader tier={permit.tier} wordSize={20} />
          </View>
        )}

        <View style={{ flexDirection: "row" }}>
          <View style={{ flex: 1, paddingRight: 14 }}>
            <Text style={s.eyebrow}>{data.institution.name} · High-voltage permit</Text>
            <Text style={{ fontSize: 34, fontWeight: 700, color: INK.text, marginTop: 2, letterSpacing: 0.5 }}>
              {permit.number}
            </Text>
            <Text style={{ fontSize: 13, color: INK.body, marginTop: 1 }}>{data.event.title}</Text>
            <View style={{ flexDirection: "row", alignItems: "center", marginTop: 9 }}>
              <StatePill state={permit.state} size={17} />
              <View style={{ marginLeft: 12 }}>
                <Label>Valid (inclusive)</Label>
                <Text style={{ fontSize: 14, fontWeight: 700, color: INK.text }}>
                  {printDay(permit.validFrom)} – {printDay(permit.validTo)}
                </Text>
                {permit.validityReason ? (
                  <Text style={{ fontSize: 8.5, color: INK.body, maxWidth: 300 }}>
                    Beyond the event days because: {permit.validityReason}
                  </Text>
                ) : null}
              </View>
            </View>
          </View>
          <QrBlock dataUrl={qr} size={100} caption="Scan for the live status" />
        </View>

        <EndedBanner
          state={permit.state}
          validTo={permit.validTo}
          revokedOn={permit.revokedOn}
          revokedReason={permit.revokedReason}
        />

        <View style={{ marginTop: 10 }}>
          <TierBlock
            tier={permit.tier}
            label={permit.tierLabel}
            detail={reasons.slice(0, 1).map((r) => (r.source ? `${r.text} Source: ${r.source}.` : r.text))}
          />
        </View>

        <View style={{ flexDirection: "row", marginTop: 10, paddingBottom: 8, ...s.rule }}>
          <Fact label="Room" value={data.event.room || data.apparatus.room} />
          <Fact label="Permit holder" value={data.holderName} />
          <Fact label="Responsible person" value={data.event.responsible} />
          <Fact label="Operators" value={operators.length ? operators.join(", ") : "the holder"} flex={1.3} />
        </View>
        <Text style={{ fontSize: 9.5, color: INK.text, marginTop: 3 }}>
          <Text style={{ color: INK.muted }}>{data.event.kindLabel || "Event"} on </Text>
          {printDays(data.event.firstDay, data.event.lastDay)}
          <Text style={{ color: INK.muted }}> · Audience </Text>
          {printAudience(data.event.audienceLabel, data.event.audienceSize)}
          <Text style={{ color: INK.muted }}> · Apparatus </Text>
          {data.apparatus.name || "—"}
        </Text>

        <Section title="The figures that set the tier">
          <View style={{ flexDirection: "row", flexWrap: "wrap" }}>
            {figures.map((f, i) => (
              <View
                key={f.label}
                style={{
                  width: "25%",
                  paddingVertical: 5,
                  paddingRight: 6,
                  borderTopWidth: i < 4 ? 0 : 0.5,
                  borderTopColor: INK.hairline,
                }}
              >
                <Label>{f.label}</Label>
                <Text style={[s.mono, { fontSize: 16, color: INK.text, marginTop: 1 }]}>{f.value}</Text>
                <Text style={{ fontSize: 7.5, color: INK.faint }}>{f.note}</Text>
              </View>
            ))}
          </View>
        </Section>

        <View style={{ flexDirection: "row", marginTop: 4 }}>
          <View style={{ flex: 1.7, paddingRight: 14 }}>
            <Section title="Before anyone touches it: discharge">
              <NumberedSteps steps={dischargeSteps(setup, assessment)} fontSize={10} />
            </Section>
          </View>
          <View style={{ flex: 1 }}>
            <Section title="Emergency">
              <EmergencyContacts contacts={data.institution.emergencyContacts} />
            </Section>
            {flags.length > 0 && (
              <Section title="Also watch for">
                {flags.map((f, i) => (
                  <Finding key={`${i}-${f.text}`} finding={f} fontSize={8} />
                ))}
              </Section>
            )}
          </View>
        </View>

        {(permit.conditions.length > 0 || data.controls.length > 0 || data.additionalControls) && (
          <Section title="Required controls and conditions" lead={conditionsBox ?? controlsGrid}>
            {conditionsBox ? controlsGrid : null}
            {data.additionalControls ? (
              <Text style={{ fontSize: 9.5, color: INK.text, marginTop: 3 }}>
                <Text style={{ fontWeight: 700 }}>Also in place: </Text>
                {data.additionalControls}
              </Text>
            ) : null}
          </Section>
        )}

        <Section
          title={`Apparatus: ${data.apparatus.name}`}
          lead={
            <>
              {sourcesHeader}
              {sources[0] ? sourceRow(sources[0], 0) : null}
            </>
          }
        >
          {sources.slice(1).map((line, i) => sourceRow(line, i + 1))}
          {gaps.map((g) => (
            <Text key={g} style={[s.mono, { fontSize: 8.5, color: INK.text, marginTop: 3 }]}>
              {g}
            </Text>
          ))}
          {data.apparatus.notes ? (
            <Text style={{ fontSize: 9, color: INK.body, marginTop: 3 }}>{data.apparatus.notes}</Text>
          ) : null}
        </Section>

        {otherReasons.length > 0 && (
          <Section
            title={
              reasons.length > 1 && gapReasons.length > 0
                ? `Further reasons for tier ${permit.tier}, and the spark gaps, with their sources`
                : reasons.length > 1
                  ? `Further reasons for tier ${permit.tier}, with their sources`
                  : "The spark gaps, with their sources"
            }
            lead={<Finding finding={otherReasons[0]} />}
          >
            {otherReasons.slice(1).map((r, i) => (
              <Finding key={`${i}-${r.text}`} finding={r} />
            ))}
          </Section>
        )}

        <Section title="Signatures" wrap={false}>
          {data.signatures.length === 0 ? (
            <Text style={{ fontSize: 10, color: INK.body }}>
              No review signatures: a tier {permit.tier} set-up is recorded and self-certified by the holder.
            </Text>
          ) : (
            data.signatures.map((sig, i) => (
              <View
                key={`${sig.signedAt}-${i}`}
                style={{
                  flexDirection: "row",
                  paddingVertical: 3,
                  borderBottomWidth: 0.5,
                  borderBottomColor: INK.hairline,
                }}
              >
                <Text style={{ width: "27%", fontSize: 10.5, fontWeight: 700, color: INK.text }}>{sig.name}</Text>
                <Text style={{ width: "18%", fontSize: 9.5, color: INK.body }}>{sig.role}</Text>
                <Text style={{ width: "33%", fontSize: 9.5, color: INK.body, paddingRight: 6 }}>{sig.meaning}</Text>
                <Text style={[s.mono, { width: "22%", fontSize: 9, color: INK.text, textAlign: "right" }]}>
                  {printTime(sig.signedAt, data.institution.timeZone)}
                </Text>
              </View>
            ))
          )}
          <View style={{ flexDirection: "row", marginTop: 5 }}>
            <Text style={{ fontSize: 8, color: INK.muted, width: 92 }}>Verification code</Text>
            <Text style={[s.mono, { fontSize: 8.5, color: INK.text }]}>{permit.verificationCode}</Text>
            <Text style={{ fontSize: 8, color: INK.muted, marginLeft: "auto" }}>
              Issued {printTime(permit.issuedAt, data.institution.timeZone)}
            </Text>
          </View>
          <View style={{ flexDirection: "row" }}>
            <Text style={{ fontSize: 8, color: INK.muted, width: 92 }}>Live status</Text>
            <Text style={[s.mono, { fontSize: 8.5, color: INK.text }]}>{permit.verificationUrl}</Text>
          </View>
        </Section>

        {/* The note about the figures and the permit's identity on every page, so a loose second sheet still says both. */}
        <View fixed style={{ position: "absolute", left: PAGE_PADDING, right: PAGE_PADDING, bottom: 16 }}>
          <AboutFiguresBox fontSize={8.5} />
          <View style={{ flexDirection: "row", justifyContent: "space-between", marginTop: 4 }}>
            <Text style={{ fontSize: 8, color: INK.muted }}>
              {permit.number} · Tier {permit.tier} · {stateLook.label.toLowerCase()} · valid to{" "}
              {printDay(permit.validTo)}
            </Text>
            <Text
              style={{ fontSize: 8, color: INK.muted }}
              render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`}
            />
          </View>
        </View>

        <Overprint state={permit.state} />
      </Page>
    </Document>
  );
}
