// Sample set-ups, one per tier, and the application content and print snapshot built from them. Pure
// (no database): the render tests use the snapshot directly; tests/pdf/support.ts stores the same
// content in the database for the HTTP tests. Tiers were read from lib/hazard's assessSetup and are
// checked again in the tests, so a change in the engine shows up here rather than silently.

import { assessSetup, requiredControls, TIER_LABELS, type SetupInput, type Tier } from "@/lib/hazard";
import type { PrintData } from "@/lib/pdf/types";
import { applicationContentSchema, type ApplicationContent } from "@/lib/applications/schemas";

export const SAMPLE_SETUPS: Record<Tier, { name: string; room: string; setup: SetupInput }> = {
  // 5 cm sphere at 100 kV: C = 4·π·ε0·r ≈ 5.56 pF, E = ½CV² ≈ 27.8 mJ (≤ 350 mJ above 15 kV): tier 0.
  0: {
    name: "Belt-charged sphere generator",
    room: "B12",
    setup: { sources: [{ id: "Sphere", kind: "sphere-terminal", radius_m: 0.05, voltage_V: 100e3 }] },
  },
  // 100 nF at 1 kV: Q = 100 µC (> 45 µC), E = 50 mJ (< 0.25 J): tier 1.
  1: {
    name: "Capacitor discharge demonstrator",
    room: "B14",
    setup: { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 100e-9, voltage_V: 1000, bleeder_ohm: 10e6 }] },
  },
  // 10 nF at 10 kV with a 100 MΩ bleeder: E = 500 mJ (≥ 0.25 J): tier 2; t = R·C·ln(10 kV/60 V) ≈ 5.12 s.
  2: {
    name: "Jar bank with spark gap",
    room: "Lecture theatre 2",
    setup: {
      sources: [{ id: "Jar bank", kind: "capacitor", capacitance_F: 10e-9, voltage_V: 10e3, bleeder_ohm: 100e6 }],
      gaps: [{ sphereDiameter_m: 0.05, spacing_m: 0.01 }],
    },
  },
  // 1 µF at 10 kV: E = 50 J (≥ 10 J at ≥ 100 V): tier 3.
  3: {
    name: "Pulse capacitor bench",
    room: "Lab 3.07",
    setup: {
      sources: [
        { id: "Main bank", kind: "capacitor", capacitance_F: 1e-6, voltage_V: 10e3, bleeder_ohm: 50e6 },
        { id: "Charger", kind: "dc-supply", voltage_V: 10e3, currentLimit_A: 5e-3 },
      ],
    },
  },
  // 4 × 100 µF in parallel at 20 kV: E = ½·400 µF·(20 kV)² = 80 kJ (≥ 10 kJ): tier 4.
  4: {
    name: "Can crusher pulsed-power bank",
    room: "High bay H1",
    setup: {
      sources: [
        { id: "Crusher bank", kind: "capacitor", capacitance_F: 100e-6, voltage_V: 20e3, count: 4, bleeder_ohm: 1e6 },
        { id: "Charger", kind: "dc-supply", voltage_V: 20e3, currentLimit_A: 0.1 },
      ],
    },
  },
};

export type Person = { id: string | null; name: string };

/** A complete, valid application content (applicationContentSchema) for a sample tier. */
export function sampleContent(
  tier: Tier,
  options: { responsible: Person; operators?: Person[]; firstDay: string; lastDay: string; room?: string },
): ApplicationContent {
  const sample = SAMPLE_SETUPS[tier];
  const content: ApplicationContent = {
    event: {
      title: `${sample.name} for the first-year lecture`,
      kind: tier === 0 ? "outreach_event" : "lecture_demonstration",
      room: options.room ?? sample.room,
      audience: "students",
      audienceSize: 120,
      firstDay: options.firstDay,
      lastDay: options.lastDay,
      responsible: { userId: options.responsible.id, name: options.responsible.name },
      operators: (options.operators ?? []).map((p) => ({ userId: p.id, name: p.name, trained: true })),
    },
    apparatus: {
      apparatusId: null,
      apparatusRevisionId: null,
      name: sample.name,
      room: sample.room,
      notes: "",
      setup: sample.setup,
    },
    controls: {
      required: requiredControls(tier).map((c) => ({ code: c.id, text: c.text, confirmed: true, note: "" })),
      additional: tier >= 3 ? "Clear acrylic screen between the bench and the first row." : "",
    },
    attachments: [],
    attestation: { accepted: true, text: "I confirm the set-up is as described and the controls are in place." },
  };
  return applicationContentSchema.parse(content);
}

/** A print snapshot for a sample tier without the database, for the pure render tests and the benchmark. */
export function samplePrintData(tier: Tier, overrides: Partial<PrintData["permit"]> = {}): PrintData {
  const sample = SAMPLE_SETUPS[tier];
  const assessment = assessSetup(sample.setup);
  const content = sampleContent(tier, {
    responsible: { id: null, name: "Imogen Tallis" },
    operators: [{ id: null, name: "Owen Pryce" }],
    firstDay: "2026-03-01",
    lastDay: "2026-03-31",
  });
  const code = "Q2hlY2tpbmcgdGhlIGJlbmNoIHBlcm1pdCBjb2RlIQ";
  return {
    layoutVersion: 2,
    institution: {
      name: "Aldermere Institute of Technology",
      emergencyContacts: [
        { label: "Campus security (24 h)", phone: "+44 20 7946 0100" },
        { label: "Safety office", phone: "+44 20 7946 0142" },
      ],
      timeZone: "Europe/London",
    },
    permit: {
      number: `HV-2026-000${tier + 1}`,
      state: "active",
      tier: assessment.tier,
      tierLabel: TIER_LABELS[assessment.tier],
      validFrom: "2026-03-01",
      validTo: "2026-03-31",
      validityReason: null,
      issuedAt: "2026-02-26T10:15:00.000Z",
      revokedOn: null,
      revokedReason: null,
      conditions: tier >= 2 ? ["Run only with the lecture theatre doors closed."] : [],
      verificationCode: code,
      verificationUrl: `https://benchclear.aldermere.test/verify/${code}`,
      ...overrides,
    },
    holderName: "Imogen Tallis",
    event: {
      title: content.event.title,
      kindLabel: "Lecture demonstration",
      room: content.event.room,
      audienceLabel: "Students",
      audienceSize: content.event.audienceSize,
      firstDay: content.event.firstDay,
      lastDay: content.event.lastDay,
      responsible: content.event.responsible.name,
      operators: content.event.operators.map((o) => ({ name: o.name, trained: Boolean(o.trained) })),
    },
    apparatus: { name: sample.name, room: sample.room, notes: "" },
    setup: sample.setup,
    assessment,
    controls: content.controls.required.map((c) => ({ text: c.text, confirmed: c.confirmed, note: c.note })),
    additionalControls: content.controls.additional,
    signatures:
      tier === 0
        ? []
        : [
            {
              name: "Rafael Quenby",
              role: "Reviewer",
              meaning: "Reviewed and recommended for approval",
              kind: "recommend",
              signedAt: "2026-02-25T09:30:00.000Z",
            },
            {
              name: "Dana Whitlock",
              role: "Safety officer",
              meaning: "Approved for use as described",
              kind: "approve",
              signedAt: "2026-02-26T10:15:00.000Z",
            },
          ],
  };
}
