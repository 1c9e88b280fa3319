// Fixtures for the application tests: a complete draft in the form's text notation, the users who
// write it, and short HTTP helpers for the draft endpoints of the production build.
import { expect } from "vitest";
import { PNG } from "pngjs";
import { assessSetup, requiredControls, type SetupInput } from "@/lib/hazard";
import { setupFromText } from "@/lib/apparatus/setup-text";
import { applicationDraftSchema, type ApplicationDraft } from "@/lib/applications/schemas";
import { createRoleSet, createUser } from "../support/db";
import { baseUrl, http, randomIp, signIn } from "../support/http";

export function isoDayFromNow(days: number): string {
  return new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
}

/**
 * The bench used by most tests: 4.7 nF at 30 kV. E = ½·C·V² = ½ · 4.7e-9 F · (3e4 V)² = 2.115 J, at or
 * above 0.25 J (tier 2, "Reflex injury") and below 10 J (hazard-model.md, default tier table).
 */
export const TIER2_SETUP_TEXT = {
  sources: [{ label: "C1", kind: "capacitor", capacitance_F: "4.7 nF", voltage_V: "30 kV", bleeder_ohm: "100 MΩ" }],
  gaps: [],
  bodyResistance_ohm: "",
  vacuumDevice: false,
} as const;

/**
 * 4.7 nF at 10 kV: Q = 47 µC, above the 45 µC level from 450 V to 15 kV (IEC 60335-1 8.1.4), and
 * E = 0.235 J, below 0.25 J: tier 1 ("Sting").
 */
export const TIER1_SETUP_TEXT = {
  sources: [{ label: "C1", kind: "capacitor", capacitance_F: "4.7 nF", voltage_V: "10 kV" }],
  gaps: [],
  bodyResistance_ohm: "",
  vacuumDevice: false,
} as const;

export function setupOf(text: unknown): SetupInput {
  const parsed = applicationDraftSchema.shape.apparatus.parse({ setup: text });
  const { setup, issues } = setupFromText(parsed.setup);
  if (!setup) throw new Error(`fixture set-up does not read: ${JSON.stringify(issues)}`);
  return setup;
}

/** A draft that passes every step: event, apparatus, all required controls confirmed, attested. */
export function completeDraft(
  responsible: { id: string; name: string },
  options: { setupText?: unknown; title?: string } = {},
): ApplicationDraft {
  const setupText = options.setupText ?? TIER2_SETUP_TEXT;
  const tier = assessSetup(setupOf(setupText)).tier;
  return applicationDraftSchema.parse({
    event: {
      title: options.title ?? "Spark gap and capacitor demonstration",
      kind: "lecture_demonstration",
      room: "B12",
      audience: "students",
      audienceSize: "40",
      firstDay: isoDayFromNow(7),
      lastDay: isoDayFromNow(8),
      responsible: { userId: responsible.id, name: responsible.name },
      operators: [{ userId: null, name: "Opal Fenwick", trained: true }],
    },
    apparatus: { name: "Capacitor on the lecture bench", room: "B12", notes: "", setup: setupText },
    controls: {
      required: requiredControls(tier).map((c) => ({ code: c.id, confirmed: true, note: "In place." })),
      additional: "Audience seated behind the second row.",
    },
    attestation: { accepted: true },
  });
}

export async function instructorWithReviewer() {
  const set = await createRoleSet();
  const cookie = await signIn(set.instructor.email);
  return { ...set, cookie };
}

export async function signedInInstructor(departmentId: string | null) {
  const user = await createUser({ roles: ["instructor"], departmentId });
  return { user, cookie: await signIn(user.email) };
}

export async function createDraft(cookie: string, body: Record<string, unknown> = {}) {
  const res = await http("/api/applications", { method: "POST", cookie, body });
  expect(res.status, res.text).toBe(201);
  return res.json!.application as { id: string; version: number; seq: number; tier: number | null };
}

export async function saveDraft(cookie: string, id: string, version: number, draft: unknown, step = 1) {
  return http(`/api/applications/${id}/draft`, {
    method: "PATCH",
    cookie,
    body: { expectedVersion: version, step, draft },
  });
}

export async function getDraft(cookie: string, id: string) {
  return http(`/api/applications/${id}/draft`, { cookie });
}

/** Creates a draft, saves `draft` into it and returns its id and current version. */
export async function savedDraft(cookie: string, draft: ApplicationDraft) {
  const created = await createDraft(cookie);
  const saved = await saveDraft(cookie, created.id, created.version, draft, 6);
  expect(saved.status, saved.text).toBe(200);
  return { id: created.id, version: saved.json!.application.version as number };
}

export async function submit(cookie: string, id: string, expectedVersion: number) {
  return http(`/api/applications/${id}/submit`, { method: "POST", cookie, body: { expectedVersion } });
}

/** A small real PNG (pngjs), `width`×`height` pixels of one colour. */
export function pngBytes(width = 8, height = 8): Buffer {
  const png = new PNG({ width, height });
  for (let i = 0; i < png.data.length; i += 4) {
    png.data[i] = 200;
    png.data[i + 1] = 120;
    png.data[i + 2] = 30;
    png.data[i + 3] = 255;
  }
  return PNG.sync.write(png);
}

/** A minimal PDF: the header and trailer file-type reads ("%PDF-"), and a one-page body. */
export function pdfBytes(): Buffer {
  return Buffer.from(
    "%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n" +
      "3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 200 200]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n",
    "latin1",
  );
}

/** Uploads through the real multipart endpoint, as the browser's XMLHttpRequest does. */
export async function upload(
  cookie: string,
  id: string,
  bytes: Buffer,
  name: string,
  type = "application/octet-stream",
) {
  const form = new FormData();
  form.append("file", new Blob([new Uint8Array(bytes)], { type }), name);
  const res = await fetch(`${baseUrl()}/api/applications/${id}/attachments`, {
    method: "POST",
    headers: { cookie, origin: baseUrl(), "x-forwarded-for": randomIp() },
    body: form,
  });
  const text = await res.text();
  let json: Record<string, any> | undefined;
  try {
    json = JSON.parse(text);
  } catch {
    json = undefined;
  }
  return { status: res.status, text, json, headers: res.headers };
}

/** Raw GET returning the bytes (the http() helper reads text). */
export async function download(cookie: string | undefined, path: string) {
  const res = await fetch(`${baseUrl()}${path}`, {
    headers: { ...(cookie ? { cookie } : {}), "x-forwarded-for": randomIp() },
    redirect: "manual",
  });
  return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
}
