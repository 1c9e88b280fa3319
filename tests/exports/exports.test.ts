// Fuller exports (issue 18, item 5): the permits CSV with apparatus, stored energy, highest voltage,
// event days, audience and operators; the apparatus inventory CSV; the full assessment PDF. Each is
// read back — the CSV with a parser written here from RFC 4180, the PDF with poppler's pdftotext.
import { describe, expect, it } from "vitest";
import { createApparatus } from "@/lib/apparatus/actions";
import type { SetupInput } from "@/lib/hazard";
import { decide } from "@/lib/review/decide";
import { createDepartment, createUser, requireDatabase, TEST_PASSWORD, uniq } from "../support/db";
import { baseUrl, http, randomIp, signIn } from "../support/http";
import { asActor, createSubmittedApplication, createTeam, TIER_SETUPS } from "../review/support";
import { createPermitFixture, pdfInfo, pdfText } from "../pdf/support";

requireDatabase();

/** RFC 4180: fields split on commas, CRLF records, quoted fields with doubled quotes. */
function parseCsv(text: string): Record<string, string>[] {
  const records: string[][] = [];
  let field = "";
  let record: string[] = [];
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") {
      record.push(field);
      field = "";
    } else if (c === "\r" && text[i + 1] === "\n") {
      record.push(field);
      records.push(record);
      record = [];
      field = "";
      i++;
    } else field += c;
  }
  const [header, ...rows] = records;
  return rows.map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
}

async function download(path: string, cookie: string) {
  const res = await fetch(`${baseUrl()}${path}`, { headers: { cookie, "x-forwarded-for": randomIp() } });
  return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
}

describe("permits CSV", () => {
  it("gains apparatus, stored energy, highest voltage, event days, audience and operators, formulas escaped", async () => {
    const team = await createTeam();
    const registry = await createApparatus(asActor(team.instructor), {
      name: "Jar bank",
      room: "B12",
      notes: "",
      setup: TIER_SETUPS[1],
    });
    const { application } = await createSubmittedApplication({
      applicant: team.instructor,
      tier: 1,
      setup: TIER_SETUPS[1],
      apparatus: { id: registry.id, revisionId: registry.revisionId, name: "-Jar bank, annex" },
      operators: [
        { id: null, name: "=SUM(A1:A9) Opal Fenwick" },
        { id: null, name: "Bryn Castell" },
      ],
      firstDay: "2027-03-04",
      lastDay: "2027-03-05",
      // Students under 50: no audience controls to confirm (lib/rules/chain.ts defaults).
      audience: "students",
      audienceSize: 35,
    });
    const { permit } = await decide(asActor(team.reviewer), application.id, {
      kind: "approve",
      expectedVersion: application.version,
      password: TEST_PASSWORD,
      confirmedRequirements: [],
      extraConditions: [],
    });
    const res = await http("/api/permits/export.csv", { cookie: await signIn(team.officer.email) });
    expect(res.status).toBe(200);
    const row = parseCsv(res.text).find((r) => r.number === permit!.number)!;
    expect(row).toBeDefined();
    // Cells that would start a formula keep a leading apostrophe (OWASP, CSV injection).
    expect(row.apparatus).toBe("'-Jar bank, annex");
    expect(row.operators).toBe("'=SUM(A1:A9) Opal Fenwick | Bryn Castell");
    // 0.45 µF at 100 V: E = ½·C·V² = ½ × 0.45e-6 F × (100 V)² = 2.25 mJ, worked by hand.
    expect(Number(row.stored_energy_J)).toBeCloseTo(2.25e-3, 9);
    expect(Number(row.highest_voltage_V)).toBe(100);
    expect([row.event_first_day, row.event_last_day]).toEqual(["2027-03-04", "2027-03-05"]);
    expect([row.audience, row.audience_size]).toEqual(["Students", "35"]);
    expect(row.tier).toBe("1");
    expect(row.state).toBe("active");
  });
});

describe("apparatus inventory CSV", () => {
  it("lists what the user may read with its figures in SI units, formulas escaped", async () => {
    const dept = await createDepartment();
    const owner = await createUser({ roles: ["instructor"], departmentId: dept.id });
    const stranger = await createUser({ roles: ["instructor"], departmentId: (await createDepartment()).id });
    const officer = await createUser({ roles: ["safety_officer"], departmentId: null });
    /** 1 µF at 10 kV: E = ½ × 1e-6 F × (1e4 V)² = 50 J by hand; Q = C·V = 10 mC. */
    const setup: SetupInput = {
      sources: [{ id: "Bank", kind: "capacitor", capacitance_F: 1e-6, voltage_V: 10_000, bleeder_ohm: 100e6 }],
    };
    const name = `=HYPERLINK("http://example.test") ${uniq("bank")}`;
    const ownerCookie = await signIn(owner.email);
    const created = await http("/api/apparatus", {
      method: "POST",
      cookie: ownerCookie,
      body: { name, room: "Lab 3.07", notes: "", setup },
    });
    expect(created.status, created.text).toBe(201);

    const res = await http("/api/apparatus/export.csv", { cookie: ownerCookie });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="benchclear-apparatus-/);
    const row = parseCsv(res.text).find((r) => r.name === `'${name}`)!;
    expect(row).toBeDefined();
    expect(Number(row.stored_energy_J)).toBeCloseTo(50, 9);
    expect(Number(row.highest_voltage_V)).toBe(10_000);
    expect(Number(row.charge_C)).toBeCloseTo(0.01, 12);
    expect(row.energy_sources).toContain("1.00 µF at 10.0 kV");
    expect([row.room, row.revision, row.owner_email]).toEqual(["Lab 3.07", "1", owner.email]);

    // Another department's instructor does not see it; a safety officer does.
    const theirs = await http("/api/apparatus/export.csv", { cookie: await signIn(stranger.email) });
    expect(parseCsv(theirs.text).some((r) => r.name === `'${name}`)).toBe(false);
    const office = await http("/api/apparatus/export.csv", { cookie: await signIn(officer.email) });
    expect(parseCsv(office.text).some((r) => r.name === `'${name}`)).toBe(true);
  });
});

describe("full assessment PDF", () => {
  it("prints every figure, reason with its publication, edition and clause, control and condition", async () => {
    const dept = await createDepartment();
    const holder = await createUser({ roles: ["instructor"], departmentId: dept.id });
    const fixture = await createPermitFixture({ tier: 3, holder, departmentId: dept.id });
    const cookie = await signIn(holder.email);
    const res = await download(`/permits/${fixture.permit.id}/assessment`, cookie);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("content-disposition")).toBe(
      `attachment; filename="${fixture.permit.number}-assessment.pdf"`,
    );
    const text = pdfText(res.bytes);
    // Letter-spaced capitals come back from pdftotext with spaces inside words.
    expect(text.replace(/\s+/g, "").toLowerCase()).toContain("fullassessmentforthefile");
    expect(text).toContain(fixture.permit.number);
    // 1 µF at 10 kV: ½ × 1e-6 F × (1e4 V)² = 50 J, and Q = 10 mC, worked by hand.
    expect(text).toContain("50.0 J");
    expect(text).toContain("10.0 mC");
    // Every reason and flag with its source line; the tier's threshold table by publication,
    // edition and clause (LBNL Electrical Safety Manual, Table 2.2.13, as hazard-references.md cites it).
    const sourceLines = text.match(/Source: /g)?.length ?? 0;
    expect(sourceLines).toBeGreaterThanOrEqual(fixture.assessment.reasons.length + fixture.assessment.flags.length);
    expect(text).toContain(
      "Lawrence Berkeley National Laboratory (LBNL) Electrical Safety Manual (current web edition)",
    );
    expect(text).toContain("Table 2.2.13");
    expect(text).not.toMatch(/hazard-references|§/);
    // Every control the applicant confirmed, and the permit's condition.
    for (const c of fixture.content.controls.required) expect(text).toContain(c.text.slice(0, 30));
    expect(text).toContain("Run only with the doors closed and the warning lamp lit.");
    expect(text).toContain("About these figures");

    const letter = await download(`/permits/${fixture.permit.id}/assessment?size=letter`, cookie);
    expect(letter.status).toBe(200);
    // US Letter is 8.5 × 11 in = 612 × 792 pt (ANSI/ASME Y14.1).
    expect(pdfInfo(letter.bytes)).toMatchObject({ width: 612, height: 792 });

    // Someone who may not see the permit gets the 404 of a permit that does not exist.
    const stranger = await createUser({ roles: ["instructor"], departmentId: (await createDepartment()).id });
    const denied = await download(`/permits/${fixture.permit.id}/assessment`, await signIn(stranger.email));
    expect(denied.status).toBe(404);
  });
});
