import crypto from "node:crypto";
import { getDb } from "@/db";
import { apparatus, apparatusInspections, apparatusRevisions } from "@/db/schema";
import { assessSetup, type SetupInput } from "@/lib/hazard";
import { getStorage, newKey } from "@/lib/storage";
import type { MatrixContext, MatrixRow, Principal, Expectation } from "../matrix-kit";

// Apparatus upkeep (issue 17, item 5): inspection records, the interval, retiring. Each cell gets an
// apparatus of the matrix instructor (the reviewer shares the department; the officer keeps any
// apparatus up; the admin, of the other department, does not read it: 404).

/** 4.7 nF at 10 kV: tier 1 (Q = 47 µC above the 45 µC level, E = 0.235 J below 0.25 J). */
const SETUP: SetupInput = { sources: [{ id: "C1", kind: "capacitor", capacitance_F: 4.7e-9, voltage_V: 10_000 }] };

const cells = (values: Record<Principal, Expectation>) => values;
const keepers = (ok: Expectation) =>
  cells({ anonymous: 401, instructor: ok, reviewer: ok, safety_officer: ok, admin: 404 });

async function instructorsApparatus(ctx: MatrixContext) {
  const assessment = assessSetup(SETUP);
  const owner = ctx.users.instructor;
  const [row] = await getDb()
    .insert(apparatus)
    .values({
      name: `Upkeep bench ${ctx.unique}`,
      room: "B12",
      departmentId: owner.departmentId!,
      ownerId: owner.id,
      tier: assessment.tier,
      energy_J: assessment.energy_J,
    })
    .returning({ id: apparatus.id });
  await getDb()
    .insert(apparatusRevisions)
    .values({
      apparatusId: row.id,
      revision: 1,
      name: `Upkeep bench ${ctx.unique}`,
      room: "B12",
      setup: SETUP,
      assessment,
      tier: assessment.tier,
      createdById: owner.id,
    });
  return { id: row.id };
}

async function withRecord(ctx: MatrixContext, photo: boolean) {
  const { id } = await instructorsApparatus(ctx);
  const bytes = Buffer.from("%PDF-1.4\n%%EOF\n", "latin1");
  let photoColumns = {};
  if (photo) {
    const key = newKey("inspections", "pdf");
    await (await getStorage()).put(key, bytes, "application/pdf");
    photoColumns = {
      photoKey: key,
      photoFilename: "matrix.pdf",
      photoContentType: "application/pdf",
      photoSize_B: bytes.length,
      photoSha256: crypto.createHash("sha256").update(bytes).digest("hex"),
    };
  }
  const [record] = await getDb()
    .insert(apparatusInspections)
    .values({
      apparatusId: id,
      kind: "grounding_hook",
      inspectedOn: "2026-01-10",
      inspectedBy: "Matrix Instructor",
      result: "pass",
      recordedById: ctx.users.instructor.id,
      ...photoColumns,
    })
    .returning({ id: apparatusInspections.id });
  return { id, inspectionId: record.id };
}

export const UPKEEP_ROWS: MatrixRow[] = [
  {
    route: "/api/apparatus/[id]/inspections",
    method: "GET",
    prepare: instructorsApparatus,
    path: (c) => `/api/apparatus/${c.data.id}/inspections`,
    expect: keepers(200),
  },
  {
    route: "/api/apparatus/[id]/inspections",
    method: "POST",
    prepare: instructorsApparatus,
    path: (c) => `/api/apparatus/${c.data.id}/inspections`,
    body: () => ({ kind: "bleeder", inspectedOn: "2026-01-10", inspectedBy: "Matrix", result: "pass" }),
    expect: keepers(201),
  },
  {
    route: "/api/apparatus/[id]/inspections/[inspectionId]/photo",
    method: "GET",
    prepare: (c) => withRecord(c, true),
    path: (c) => `/api/apparatus/${c.data.id}/inspections/${c.data.inspectionId}/photo`,
    expect: keepers(200),
  },
  {
    route: "/api/apparatus/[id]/inspections/[inspectionId]/photo",
    method: "POST",
    prepare: (c) => withRecord(c, false),
    path: (c) => `/api/apparatus/${c.data.id}/inspections/${c.data.inspectionId}/photo`,
    // The matrix sends JSON: keepers get past every check to the media type (415); the multipart
    // path is tested in tests/upkeep/upkeep.test.ts.
    body: () => ({}),
    expect: keepers(415),
  },
  {
    route: "/api/apparatus/[id]/upkeep",
    method: "PATCH",
    prepare: instructorsApparatus,
    path: (c) => `/api/apparatus/${c.data.id}/upkeep`,
    body: () => ({ inspectionInterval_days: 180 }),
    expect: keepers(200),
  },
  {
    route: "/api/apparatus/[id]/retire",
    method: "POST",
    prepare: instructorsApparatus,
    path: (c) => `/api/apparatus/${c.data.id}/retire`,
    body: () => ({ reason: "Matrix check." }),
    expect: keepers(200),
  },
];
