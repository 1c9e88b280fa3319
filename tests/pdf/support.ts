// Fixtures for the permit PDF and verification tests: permits inserted straight into the test
// database (users, an approved application with a valid revision and its assessment, signed
// decisions, the permit row), and tools to read a PDF back: text (pdftotext), page sizes (pdfinfo)
// and the QR code (pdftoppm → pngjs → jsqr). Poppler is Debian's poppler-utils, which npm test installs.
import { execFileSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import { eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import {
  applicationRevisions,
  applications,
  decisions,
  institutionSettings,
  permitCounters,
  permits,
  type EmergencyContact,
  type User,
} from "@/db/schema";
import { assessSetup, type Tier } from "@/lib/hazard";
import { sealDecision } from "@/lib/records/seal";
import { revisionHash } from "@/lib/signing/canonical";
import { createDepartment, createUser } from "../support/db";
import { sampleContent, SAMPLE_SETUPS } from "./samples";

const require = createRequire(import.meta.url);
const { PNG } = require("pngjs") as {
  PNG: { sync: { read(buffer: Buffer): { width: number; height: number; data: Buffer } } };
};
const jsQR = require("jsqr") as (
  data: Uint8ClampedArray,
  width: number,
  height: number,
  options?: { inversionAttempts?: "dontInvert" | "attemptBoth" },
) => { data: string } | null;

export const INSTITUTION = "Aldermere Institute of Technology";
export const CONTACTS: EmergencyContact[] = [
  { label: "Campus security (24 h)", phone: "+44 20 7946 0100" },
  { label: "Safety office", phone: "+44 20 7946 0142" },
];

/** The one institution_settings row, as the permits print it (UTC days unless a test says otherwise). */
export async function ensureInstitution(timeZone = "UTC"): Promise<void> {
  await getDb()
    .insert(institutionSettings)
    .values({ id: 1, name: INSTITUTION, timeZone, emergencyContacts: CONTACTS })
    .onConflictDoUpdate({
      target: institutionSettings.id,
      set: { name: INSTITUTION, timeZone, emergencyContacts: CONTACTS },
    });
}

export function isoDayFromToday(days: number): string {
  return new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
}

/** The next number of 2026 through the same counter the app uses, so fixture numbers never collide. */
async function nextNumber(): Promise<{ year: number; seq: number; number: string }> {
  const [row] = await getDb()
    .insert(permitCounters)
    .values({ year: 2026, last: 1 })
    .onConflictDoUpdate({ target: permitCounters.year, set: { last: sql`${permitCounters.last} + 1` } })
    .returning({ last: permitCounters.last });
  return { year: 2026, seq: row.last, number: `HV-2026-${String(row.last).padStart(4, "0")}` };
}

export type PermitFixture = Awaited<ReturnType<typeof createPermitFixture>>;

export async function createPermitFixture(
  options: {
    tier?: Tier;
    holder?: Pick<User, "id" | "name">;
    departmentId?: string;
    state?: "active" | "revoked" | "expired";
    validFrom?: string;
    validTo?: string;
    conditions?: string[];
    /** Where the event takes place (the event's room); the sample's room when not given. */
    room?: string;
  } = {},
) {
  await ensureInstitution();
  const db = getDb();
  const tier = options.tier ?? 3;
  const departmentId = options.departmentId ?? (await createDepartment()).id;
  const holder = options.holder ?? (await createUser({ roles: ["instructor"], departmentId }));
  const [operator, reviewer, officer] = await Promise.all([
    createUser({ roles: ["instructor"], departmentId, name: `Operator ${crypto.randomBytes(3).toString("hex")}` }),
    createUser({ roles: ["reviewer"], departmentId, name: `Reviewer ${crypto.randomBytes(3).toString("hex")}` }),
    createUser({ roles: ["safety_officer"], name: `Officer ${crypto.randomBytes(3).toString("hex")}` }),
  ]);

  const state = options.state ?? "active";
  const validFrom = options.validFrom ?? (state === "expired" ? isoDayFromToday(-40) : isoDayFromToday(-5));
  const validTo = options.validTo ?? (state === "expired" ? isoDayFromToday(-1) : isoDayFromToday(25));
  const content = sampleContent(tier, {
    responsible: { id: holder.id, name: holder.name },
    operators: [{ id: operator.id, name: operator.name }],
    firstDay: validFrom,
    lastDay: validTo,
    room: options.room,
  });
  const assessment = assessSetup(SAMPLE_SETUPS[tier].setup);
  if (assessment.tier !== tier) throw new Error(`sample set-up for tier ${tier} assesses as tier ${assessment.tier}`);
  const contentHash = revisionHash(content, assessment);

  const [application] = await db
    .insert(applications)
    .values({
      title: content.event.title,
      applicantId: holder.id,
      departmentId,
      state: "approved",
      namedUserIds: [holder.id, operator.id],
      tier,
      submittedAt: new Date(Date.now() - 3 * 86_400_000),
      decidedAt: new Date(Date.now() - 86_400_000),
    })
    .returning();
  const [revision] = await db
    .insert(applicationRevisions)
    .values({
      applicationId: application.id,
      revision: 1,
      content,
      assessment,
      tier,
      contentHash,
      submittedById: holder.id,
    })
    .returning();
  await db.update(applications).set({ currentRevisionId: revision.id }).where(eq(applications.id, application.id));

  // Tier 0 is self-certified (no chain); tier 1 has one reviewer; tiers 2–4 a reviewer then an officer.
  const signed = (
    kind: "recommend" | "approve" | "revoke",
    step: number | null,
    signer: User,
    role: string,
    meaning: string,
    hoursAgo: number,
  ) => ({
    applicationId: application.id,
    revisionId: revision.id,
    kind,
    step,
    signerId: signer.id,
    signerName: signer.name,
    signerRole: role,
    meaning,
    contentHash,
    signedAt: new Date(Date.now() - hoursAgo * 3_600_000),
    ...(kind === "approve" ? { validFrom, validTo, conditions: permitConditions } : {}),
  });
  const permitConditions =
    options.conditions ?? (tier >= 2 ? ["Run only with the doors closed and the warning lamp lit."] : []);
  const chain =
    tier === 0
      ? []
      : tier === 1
        ? [signed("approve", 1, reviewer, "Reviewer", "Approved for use as described", 30)]
        : [
            signed("recommend", 1, reviewer, "Reviewer", "Reviewed and recommended for approval", 40),
            signed("approve", 2, officer, "Safety officer", "Approved for use as described", 30),
          ];
  if (chain.length) await db.insert(decisions).values(chain.map((d) => sealDecision(d)));

  const { year, seq, number } = await nextNumber();
  const revoked = state === "revoked";
  const [permit] = await db
    .insert(permits)
    .values({
      number,
      year,
      seq,
      applicationId: application.id,
      revisionId: revision.id,
      holderId: holder.id,
      state: revoked ? "revoked" : "active",
      tier,
      validFrom,
      validTo,
      conditions: permitConditions,
      verificationCode: crypto.randomBytes(32).toString("base64url"),
      issuedAt: new Date(Date.now() - 30 * 3_600_000),
      ...(revoked
        ? {
            revokedAt: new Date(Date.now() - 3_600_000),
            revokedById: officer.id,
            revokedReason: "The bleeder failed its check.",
          }
        : {}),
    })
    .returning();
  if (revoked) {
    await db
      .insert(decisions)
      .values(
        sealDecision(signed("revoke", null, officer, "Safety officer", "Revoked: the permit no longer holds", 1)),
      );
  }
  return { permit, application, revision, content, assessment, holder, operator, reviewer, officer, departmentId };
}

/** Revokes a fixture permit the way the revoke decision leaves it (state, time, signer, reason). */
export async function revokeFixture(
  fixture: PermitFixture,
  reason = "The interlock was found bypassed.",
): Promise<void> {
  const db = getDb();
  await db
    .update(permits)
    .set({
      state: "revoked",
      revokedAt: new Date(),
      revokedById: fixture.officer.id,
      revokedReason: reason,
      version: sql`${permits.version} + 1`,
    })
    .where(eq(permits.id, fixture.permit.id));
  await db.insert(decisions).values(
    sealDecision({
      applicationId: fixture.application.id,
      revisionId: fixture.revision.id,
      kind: "revoke",
      step: null,
      signerId: fixture.officer.id,
      signerName: fixture.officer.name,
      signerRole: "Safety officer",
      meaning: "Revoked: the permit no longer holds",
      contentHash: fixture.revision.contentHash,
    }),
  );
}

// --- Reading PDFs back ------------------------------------------------------------------------

function tempFile(bytes: Buffer, ext: string): string {
  const file = path.join(os.tmpdir(), `benchclear-pdf-${crypto.randomBytes(6).toString("hex")}.${ext}`);
  fs.writeFileSync(file, bytes);
  return file;
}

/**
 * The text of each page as pdftotext reads it in drawing order (-raw: a wrapped line stays beside the
 * rest of its sentence even in a two-column list), with runs of white space folded to one space.
 */
export function pdfPages(pdf: Buffer): string[] {
  const file = tempFile(pdf, "pdf");
  try {
    const out = execFileSync("/usr/bin/pdftotext", ["-raw", "-enc", "UTF-8", file, "-"], { encoding: "utf8" });
    return out.split("\f").map(folded).filter(Boolean);
  } finally {
    fs.rmSync(file, { force: true });
  }
}

/** The whole PDF's text (pages joined), white space folded. */
export function pdfText(pdf: Buffer): string {
  return pdfPages(pdf).join(" ");
}

/** Page count and the first page's size in points, from pdfinfo. */
export function pdfInfo(pdf: Buffer): { pages: number; width: number; height: number } {
  const file = tempFile(pdf, "pdf");
  try {
    const out = execFileSync("/usr/bin/pdfinfo", [file], { encoding: "utf8" });
    const pages = Number(/^Pages:\s+(\d+)/m.exec(out)?.[1]);
    const size = /^Page size:\s+([\d.]+) x ([\d.]+) pts/m.exec(out);
    return { pages, width: Number(size?.[1]), height: Number(size?.[2]) };
  } finally {
    fs.rmSync(file, { force: true });
  }
}

/** Decodes the QR code on the first page: rasterised at 150 dpi by pdftoppm, read by jsqr. */
export function decodeQr(pdf: Buffer): string | null {
  const file = tempFile(pdf, "pdf");
  const prefix = file.replace(/\.pdf$/, "");
  try {
    execFileSync("/usr/bin/pdftoppm", ["-png", "-r", "150", "-f", "1", "-l", "1", "-singlefile", file, prefix]);
    const png = PNG.sync.read(fs.readFileSync(`${prefix}.png`));
    return (
      jsQR(new Uint8ClampedArray(png.data.buffer, png.data.byteOffset, png.data.length), png.width, png.height)?.data ??
      null
    );
  } finally {
    fs.rmSync(file, { force: true });
    fs.rmSync(`${prefix}.png`, { force: true });
  }
}

/**
 * Decodes the QR codes on the first page (the bench card has two, side by side). jsqr reads one
 * symbol per image and none when two share it, so the page (at 100 dpi) is cut into a left and a
 * right part every 30 px from the right edge (the codes' white quiet zones and the gap between them
 * are wider than that) until `expected` different codes are read.
 */
export function decodeQrs(pdf: Buffer, expected = 2, topShare = 1): string[] {
  const file = tempFile(pdf, "pdf");
  const prefix = file.replace(/\.pdf$/, "");
  try {
    execFileSync("/usr/bin/pdftoppm", ["-png", "-r", "100", "-f", "1", "-l", "1", "-singlefile", file, prefix]);
    const png = PNG.sync.read(fs.readFileSync(`${prefix}.png`));
    // Only the top `topShare` of the page is read when the caller knows the codes sit there.
    const height = Math.round(png.height * topShare);
    const crop = (x0: number, x1: number) => {
      const width = x1 - x0;
      const out = new Uint8ClampedArray(width * height * 4);
      for (let y = 0; y < height; y++) {
        const from = (y * png.width + x0) * 4;
        out.set(png.data.subarray(from, from + width * 4), y * width * 4);
      }
      return jsQR(out, width, height, { inversionAttempts: "dontInvert" })?.data ?? null;
    };
    const found = new Set<string>();
    for (let split = png.width - 30; split > 30 && found.size < expected; split -= 30) {
      for (const code of [crop(split, png.width), crop(0, split)]) if (code) found.add(code);
    }
    return [...found];
  } finally {
    fs.rmSync(file, { force: true });
    fs.rmSync(`${prefix}.png`, { force: true });
  }
}

/** pdftotext output contains this text, compared with white space folded (lines wrap anywhere). */
export function folded(text: string): string {
  return text.replace(/\s+/g, " ").trim();
}
