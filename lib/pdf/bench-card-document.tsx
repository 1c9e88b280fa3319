import { Document, Page, Text, View } from "@react-pdf/renderer";
import { formatQuantity } from "@/lib/hazard";
import { approachBeyondTable, dischargeSteps, printAudience, printDay, printDays } from "./content";
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
  s,
} from "./parts";
import { TIER_COLOURS } from "@/lib/tier-colours";
import { INK } from "./theme";
import type { PaperSize, PrintData } from "./types";

// The bench card: one page to laminate and fix beside the apparatus. It says what to do before
// touching the set-up, whom to call, how far to keep back, and where to check that the permit still
// holds. Everything else is on the permit. Lists are capped so the card never runs onto a second page.

const MAX_CONTACTS = 5;
const MAX_STEPS = 7;

/**
 * `scale` shrinks the large parts (steps, contacts, distances, QR code) when a long procedure or
 * many contacts would push the card onto a second page; render.tsx picks the largest that fits.
 */
export function BenchCardDocument({
  data,
  size,
  qr,
  checkQr = null,
  scale = 1,
}: {
  data: PrintData;
  size: PaperSize;
  qr: string;
  /** The second code: the signed-in page for recording a pre-use check (null on older snapshots). */
  checkQr?: string | null;
  scale?: number;
}) {
  const { permit, assessment, setup } = data;
  const tierColours = TIER_COLOURS[permit.tier];
  const steps = dischargeSteps(setup, assessment).slice(0, MAX_STEPS);
  const { limited_m, restricted_m } = assessment.approach;
  // Above the last row of the approach tables there is no published distance: say who sets it.
  const distance = (value: number | null) =>
    value !== null
      ? formatQuantity(value, "m")
      : approachBeyondTable(assessment)
        ? "set by a qualified person"
        : "none";

  return (
    <Document
      title={`Bench card ${permit.number}`}
      author={data.institution.name}
      subject={`Bench card for permit ${permit.number}: ${data.apparatus.name}`}
      creator="Benchclear"
      producer="Benchclear"
      language="en-GB"
      creationDate={new Date(permit.issuedAt)}
    >
      <Page size={size === "letter" ? "LETTER" : "A4"} style={[s.page, { padding: 32, paddingBottom: 26 }]}>
        <View
          style={{ position: "absolute", top: 0, left: 0, right: 0, height: 10, backgroundColor: tierColours.swatch }}
        />

        {permit.tier > 0 && (
          <View style={{ marginBottom: 10 * scale }}>
            <HazardHeader tier={permit.tier} wordSize={24 * scale} />
          </View>
        )}

        <View style={{ flexDirection: "row" }}>
          <View style={{ flex: 1, paddingRight: 14 }}>
            <Text style={s.eyebrow}>{data.institution.name} · Bench card</Text>
            {/* From tier 1 the hazard header above already opens with the hazard. */}
            {permit.tier === 0 && (
              <Text style={{ fontSize: 20, fontWeight: 700, color: INK.text, marginTop: 4 }}>High voltage</Text>
            )}
            <Text style={{ fontSize: 13, color: INK.body }}>{data.apparatus.name}</Text>
            <Text style={{ fontSize: 11, color: INK.muted, marginTop: 2 }}>
              Room {data.event.room || data.apparatus.room}
            </Text>
            <Text style={{ fontSize: 28, fontWeight: 700, color: INK.text, marginTop: 10, letterSpacing: 0.5 }}>
              {permit.number}
            </Text>
            <View style={{ flexDirection: "row", alignItems: "center", marginTop: 6 }}>
              <StatePill state={permit.state} size={16} />
              <Text style={{ marginLeft: 10, fontSize: 12, color: INK.text }}>
                {printDay(permit.validFrom)} – {printDay(permit.validTo)}
              </Text>
            </View>
            <Text style={{ fontSize: 10, color: INK.body, marginTop: 6 }}>Holder: {data.holderName}</Text>
            <Text style={{ fontSize: 10, color: INK.body, marginTop: 2 }}>
              Event: {printDays(data.event.firstDay, data.event.lastDay)} · Audience:{" "}
              {printAudience(data.event.audienceLabel, data.event.audienceSize)}
            </Text>
          </View>
          {/* Two codes side by side, each captioned, so nobody scans the wrong one: the public status
              page, and the pre-use check (which asks the person to sign in). */}
          <View style={{ flexDirection: "row" }}>
            <QrBlock
              dataUrl={qr}
              size={Math.round((checkQr ? 118 : 150) * Math.max(scale, 0.8))}
              caption="Scan to check this permit is still valid"
            />
            {checkQr && (
              <View style={{ marginLeft: 12 }}>
                <QrBlock
                  dataUrl={checkQr}
                  size={Math.round(118 * Math.max(scale, 0.8))}
                  caption="Record a pre-use check (sign-in)"
                />
              </View>
            )}
          </View>
        </View>

        <EndedBanner
          state={permit.state}
          validTo={permit.validTo}
          revokedOn={permit.revokedOn}
          revokedReason={permit.revokedReason}
        />

        <View style={{ marginTop: 12 }}>
          <TierBlock tier={permit.tier} label={permit.tierLabel} />
        </View>

        <View style={{ marginTop: 18 * scale }}>
          <Text style={[s.h2, { fontSize: 13 }]}>Before anyone touches it</Text>
          <NumberedSteps steps={steps} fontSize={15 * scale} />
        </View>

        <View style={{ flexDirection: "row", marginTop: 14 * scale }}>
          <View style={{ flex: 1, paddingRight: 16 }}>
            <Text style={[s.h2, { fontSize: 13 }]}>Emergency</Text>
            <EmergencyContacts
              contacts={data.institution.emergencyContacts.slice(0, MAX_CONTACTS)}
              phoneSize={20 * scale}
            />
          </View>
          <View style={{ flex: 1 }}>
            <Text style={[s.h2, { fontSize: 13 }]}>Keep back</Text>
            <View style={{ marginBottom: 5 }}>
              <Text style={{ fontSize: 10, color: INK.muted }}>Audience: limited approach</Text>
              <Text style={[s.mono, { fontSize: 20 * scale, color: INK.text }]}>{distance(limited_m)}</Text>
            </View>
            <View style={{ marginBottom: 5 }}>
              <Text style={{ fontSize: 10, color: INK.muted }}>Trained people only: restricted approach</Text>
              <Text style={[s.mono, { fontSize: 20 * scale, color: INK.text }]}>{distance(restricted_m)}</Text>
            </View>
            <View>
              <Text style={{ fontSize: 10, color: INK.muted }}>Maximum voltage · stored energy</Text>
              <Text style={[s.mono, { fontSize: 16 * scale, color: INK.text }]}>
                {formatQuantity(assessment.maxVoltage_V, "V")} · {formatQuantity(assessment.energy_J, "J")}
              </Text>
            </View>
          </View>
        </View>

        {/* Pushes the note about the figures to the foot of the page while the content above leaves room. */}
        <View style={{ flexGrow: 1 }} />
        <View style={{ marginTop: 12 }}>
          <AboutFiguresBox fontSize={9.5} />
          <Text style={[s.mono, { fontSize: 7.5, color: INK.muted, marginTop: 4 }]}>{permit.verificationUrl}</Text>
          {permit.checkUrl && checkQr && (
            <Text style={[s.mono, { fontSize: 7.5, color: INK.muted, marginTop: 1 }]}>
              Pre-use check: {permit.checkUrl}
            </Text>
          )}
        </View>

        <Overprint state={permit.state} />
      </Page>
    </Document>
  );
}
