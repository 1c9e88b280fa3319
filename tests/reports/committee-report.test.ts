import crypto from "node:crypto";
import { sql } from "drizzle-orm";
import { quantileSeq } from "mathjs";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applicationRevisions, applications, decisions, departments, incidents, permits, users } from "@/db/schema";
import { eq } from "drizzle-orm";
import { currentUserColumns } from "@/lib/auth/current-user";
import { sealDecision } from "@/lib/records/seal";
import { revisionHash } from "@/lib/signing/canonical";
import { committeeReport, reportFilters } from "@/lib/reports/queries";
import { reportTable } from "@/lib/reports/tables";
import { pdfText } from "../pdf/support";
import { createUser, requireDatabase, uniq } from "../support/db";
import { baseUrl, http, randomIp, signIn } from "../support/http";

requireDatabase();

// Issue 18, item 2: the committee report. The test writes its own applications, revisions, signed
// decisions and permits (with chosen times) into two departments of its own, and checks every figure
// against SQL written here, not the report's query; percentiles by mathjs (quantileSeq: linear
// interpolation between ranks, the definition PostgreSQL's percentile_cont uses). Filtering by its own
// department keeps other tests' rows out of every figure.

const H = 3_600_000;
const FROM = "2025-01-01";
const TO = "2025-06-30";
const at = (iso: string) => new Date(`${iso}Z`);
const addDays = (iso: string, days: number) =>
  new Date(Date.parse(`${iso}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);

let seq = 0;
const yearForRun = 3000 + crypto.randomInt(0, 29000);

type Case = {
  tier: 0 | 1 | 2 | 3 | 4;
  /** Each revision: when it was submitted and the decisions on it (hours after that submission). */
  revisions: {
    submittedAt: Date;
    decisions: { kind: "recommend" | "return" | "approve" | "reject"; afterHours: number }[];
  }[];
  permit?: { issuedAt: Date; validFrom: string; validTo: string; state?: "active" | "revoked" | "expired" };
};

async function makeCase(departmentId: string, applicant: { id: string; name: string }, c: Case) {
  const db = getDb();
  const [app] = await db
    .insert(applications)
    .values({ title: uniq("Report case"), applicantId: applicant.id, departmentId, state: "approved", tier: c.tier })
    .returning();
  let lastRevision = "";
  for (const [i, r] of c.revisions.entries()) {
    // The hash of what the revision holds, as a real submission stores it: the records check (tests/records)
    // verifies every decision in the database against its revision's content.
    const content = { reportCase: app.id, revision: i + 1 };
    const hash = revisionHash(content, {});
    const [rev] = await db
      .insert(applicationRevisions)
      .values({
        applicationId: app.id,
        revision: i + 1,
        content,
        assessment: {} as never,
        tier: c.tier,
        contentHash: hash,
        submittedById: applicant.id,
        submittedAt: r.submittedAt,
      })
      .returning();
    lastRevision = rev.id;
    for (const [step, d] of r.decisions.entries()) {
      await db.insert(decisions).values(
        sealDecision({
          applicationId: app.id,
          revisionId: rev.id,
          kind: d.kind,
          step: step + 1,
          signerId: applicant.id,
          signerName: "Report signer",
          signerRole: "Safety officer",
          meaning: "test",
          contentHash: hash,
          signedAt: new Date(r.submittedAt.getTime() + d.afterHours * H),
          // An approval seals the validity and conditions its permit carries (the records check compares them).
          ...(d.kind === "approve" && c.permit
            ? { validFrom: c.permit.validFrom, validTo: c.permit.validTo, conditions: [] }
            : {}),
        }),
      );
    }
  }
  if (c.permit) {
    seq += 1;
    const [p] = await db
      .insert(permits)
      .values({
        number: `RPT-${yearForRun}-${seq}-${crypto.randomBytes(3).toString("hex")}`,
        year: yearForRun,
        seq: crypto.randomInt(1, 2_000_000_000),
        applicationId: app.id,
        revisionId: lastRevision,
        holderId: applicant.id,
        state: c.permit.state ?? "active",
        tier: c.tier,
        validFrom: c.permit.validFrom,
        validTo: c.permit.validTo,
        verificationCode: crypto.randomBytes(32).toString("base64url"),
        issuedAt: c.permit.issuedAt,
      })
      .returning();
    return { application: app, permit: p };
  }
  return { application: app, permit: null };
}

describe("the committee report", () => {
  const u = uniq("rpt");
  let dept = "";
  let officerCookie = "";
  let officerId = "";
  let today = "";
  let timeZone = "UTC";

  beforeAll(async () => {
    // A name a spreadsheet would run as a formula: the CSV must neutralise it.
    const [d] = await getDb()
      .insert(departments)
      .values({ name: `=HYPERLINK("x") ${u}`, code: u })
      .returning();
    const [other] = await getDb()
      .insert(departments)
      .values({ name: `Other ${u}`, code: `${u}-o` })
      .returning();
    dept = d.id;
    const applicant = await createUser({ roles: ["instructor"], departmentId: dept });
    const outsider = await createUser({ roles: ["instructor"], departmentId: other.id });
    const officer = await createUser({ roles: ["safety_officer"] });
    officerId = officer.id;
    officerCookie = await signIn(officer.email);
    const f = await reportFilters({});
    today = f.today;
    timeZone = f.timeZone;

    const cases: Case[] = [
      // Issued in range: Jan (tiers 2, 3), Mar (tier 2, after one return), and a tier-1 with a reject.
      {
        tier: 2,
        revisions: [
          {
            submittedAt: at("2025-01-10T09:00:00"),
            decisions: [
              { kind: "recommend", afterHours: 5 },
              { kind: "approve", afterHours: 10 },
            ],
          },
        ],
        permit: { issuedAt: at("2025-01-10T19:00:00"), validFrom: "2025-01-11", validTo: "2025-02-10" },
      },
      {
        tier: 3,
        revisions: [{ submittedAt: at("2025-01-15T08:00:00"), decisions: [{ kind: "approve", afterHours: 48 }] }],
        permit: { issuedAt: at("2025-01-17T08:00:00"), validFrom: "2025-01-17", validTo: "2025-03-01" },
      },
      {
        tier: 2,
        revisions: [
          { submittedAt: at("2025-02-20T10:00:00"), decisions: [{ kind: "return", afterHours: 20 }] },
          { submittedAt: at("2025-03-01T10:00:00"), decisions: [{ kind: "approve", afterHours: 30 }] },
        ],
        permit: { issuedAt: at("2025-03-02T16:00:00"), validFrom: "2025-03-03", validTo: "2025-04-01" },
      },
      {
        tier: 2,
        revisions: [
          { submittedAt: at("2025-04-01T10:00:00"), decisions: [{ kind: "return", afterHours: 100 }] },
          { submittedAt: at("2025-04-10T10:00:00"), decisions: [{ kind: "return", afterHours: 3 }] },
          { submittedAt: at("2025-04-12T10:00:00"), decisions: [{ kind: "return", afterHours: 7 }] },
          { submittedAt: at("2025-04-20T10:00:00"), decisions: [{ kind: "reject", afterHours: 12 }] },
        ],
      },
      {
        tier: 3,
        revisions: [{ submittedAt: at("2025-05-05T10:00:00"), decisions: [{ kind: "approve", afterHours: 72 }] }],
        permit: { issuedAt: at("2025-05-08T10:00:00"), validFrom: "2025-05-08", validTo: "2025-05-30" },
      },
      // Outside the range: issued in July, decided in July.
      {
        tier: 2,
        revisions: [{ submittedAt: at("2025-07-02T10:00:00"), decisions: [{ kind: "approve", afterHours: 4 }] }],
        permit: { issuedAt: at("2025-07-02T14:00:00"), validFrom: "2025-07-03", validTo: "2025-07-30" },
      },
      // Active now (each issued before the range's end, ending at different distances from today).
      {
        tier: 4,
        revisions: [{ submittedAt: at("2025-06-01T10:00:00"), decisions: [{ kind: "approve", afterHours: 6 }] }],
        permit: { issuedAt: at("2025-06-01T16:00:00"), validFrom: "2025-06-02", validTo: addDays(today, 10) },
      },
      {
        tier: 2,
        revisions: [{ submittedAt: at("2024-12-01T10:00:00"), decisions: [] }],
        permit: { issuedAt: at("2024-12-01T10:00:00"), validFrom: "2024-12-02", validTo: addDays(today, 89) },
      },
      {
        tier: 2,
        revisions: [{ submittedAt: at("2024-12-02T10:00:00"), decisions: [] }],
        permit: { issuedAt: at("2024-12-02T10:00:00"), validFrom: "2024-12-02", validTo: addDays(today, 90) },
      },
      {
        tier: 3,
        revisions: [{ submittedAt: at("2024-12-03T10:00:00"), decisions: [] }],
        permit: {
          issuedAt: at("2024-12-03T10:00:00"),
          validFrom: "2024-12-03",
          validTo: addDays(today, 200),
          state: "revoked",
        },
      },
      {
        tier: 1,
        revisions: [{ submittedAt: at("2024-12-04T10:00:00"), decisions: [] }],
        permit: { issuedAt: at("2024-12-04T10:00:00"), validFrom: "2024-12-04", validTo: addDays(today, -1) },
      },
    ];
    const made = [];
    for (const c of cases) made.push(await makeCase(dept, applicant, c));
    // Another department's permit in the range: never in this department's figures.
    const outside = await makeCase(other.id, outsider, cases[0]);

    // Incident and near-miss reports. A report counts for the department of the permit it names, else
    // of its reporter (none here names only an apparatus).
    const incidentRow = (
      kind: "incident" | "near_miss",
      occurredAt: string,
      reporterId: string,
      permitId: string | null,
      injuries = false,
    ) => ({
      kind,
      summary: uniq("Report incident"),
      description: "Written by the committee report test.",
      occurredAt: at(occurredAt),
      location: "Room 1, Test Hall",
      injuries,
      permitId,
      reporterId,
    });
    await getDb()
      .insert(incidents)
      .values([
        // February: an incident with someone hurt, reported by the other department under this one's permit…
        incidentRow("incident", "2025-02-14T12:00:00", outsider.id, made[0].permit!.id, true),
        // …and a near miss reported by this department's instructor, naming no permit.
        incidentRow("near_miss", "2025-02-20T09:00:00", applicant.id, null),
        // March: the other department's, naming no permit: not this department's.
        incidentRow("incident", "2025-03-10T09:00:00", outsider.id, null),
        // April: this department's instructor under the other department's permit: that department's.
        incidentRow("near_miss", "2025-04-10T09:00:00", applicant.id, outside.permit!.id),
        // June: a near miss in this department; July: outside the range.
        incidentRow("near_miss", "2025-06-15T12:00:00", applicant.id, null),
        incidentRow("incident", "2025-07-03T12:00:00", applicant.id, null, true),
      ]);
  });

  const officer = async () => {
    const [row] = await getDb().select(currentUserColumns).from(users).where(eq(users.id, officerId));
    return row;
  };
  const report = async () =>
    committeeReport(await officer(), await reportFilters({ from: FROM, to: TO, department: dept }));

  it("counts permits issued per month by tier as this SQL does", async () => {
    const r = await report();
    const rows = (
      await getDb().execute<{ month: string; tier: number; n: number }>(sql`
        SELECT to_char(p.issued_at AT TIME ZONE ${timeZone}, 'YYYY-MM') AS month, p.tier, count(*)::int AS n
        FROM permit p, application a
        WHERE a.id = p.application_id AND a.department_id = ${dept}::uuid
          AND p.issued_at AT TIME ZONE ${timeZone} >= ${FROM}::timestamp
          AND p.issued_at AT TIME ZONE ${timeZone} < ${addDays(TO, 1)}::timestamp
        GROUP BY 1, 2`)
    ).rows;
    const expected = new Map(rows.map((x) => [`${x.month}/${x.tier}`, x.n]));
    expect(r.issued.map((m) => m.month)).toEqual(["2025-01", "2025-02", "2025-03", "2025-04", "2025-05", "2025-06"]);
    for (const m of r.issued)
      for (const t of [0, 1, 2, 3, 4] as const)
        expect(m.tiers[t], `${m.month} tier ${t}`).toBe(expected.get(`${m.month}/${t}`) ?? 0);
    // The worked example by hand: Jan one tier 2 and one tier 3, Mar one tier 2, May one tier 3, Jun one tier 4.
    expect(r.issued.map((m) => m.total)).toEqual([2, 0, 1, 0, 1, 1]);
  });

  it("gives the median and 90th percentile of the wait for a decision per tier, as mathjs computes them", async () => {
    const r = await report();
    const waits = (
      await getDb().execute<{ tier: number; hours: number }>(sql`
        SELECT r.tier, extract(epoch FROM min(d.signed_at) - r.submitted_at) / 3600 AS hours
        FROM application_revision r
        JOIN application a ON a.id = r.application_id
        JOIN decision d ON d.revision_id = r.id AND d.kind <> 'recommend' AND d.kind <> 'revoke'
        WHERE a.department_id = ${dept}::uuid
        GROUP BY r.id, r.tier, r.submitted_at
        HAVING (min(d.signed_at) AT TIME ZONE ${timeZone})::date BETWEEN ${FROM}::date AND ${TO}::date`)
    ).rows;
    const tiers = [...new Set(waits.map((w) => w.tier))].sort();
    expect(r.decisionTimes.map((d) => d.tier)).toEqual(tiers);
    for (const d of r.decisionTimes) {
      const hours = waits.filter((w) => w.tier === d.tier).map((w) => Number(w.hours));
      expect(d.decisions).toBe(hours.length);
      expect(d.medianHours).toBeCloseTo(Number(quantileSeq(hours, 0.5)), 6);
      expect(d.p90Hours).toBeCloseTo(Number(quantileSeq(hours, 0.9)), 6);
    }
    // By hand for tier 2: waits 10, 20, 30, 100, 3, 7, 12 h → sorted 3 7 10 12 20 30 100; median 12 h;
    // 90th percentile at rank 0.9 × 6 = 5.4 → 30 + 0.4 × 70 = 58 h (linear interpolation, common practice).
    const tier2 = r.decisionTimes.find((d) => d.tier === 2)!;
    expect(tier2.medianHours).toBeCloseTo(12, 6);
    expect(tier2.p90Hours).toBeCloseTo(58, 6);
  });

  it("counts returns per application first submitted in the range", async () => {
    const r = await report();
    const rows = (
      await getDb().execute<{ tier: number; returns: number }>(sql`
        SELECT a.tier, (SELECT count(*)::int FROM decision d WHERE d.application_id = a.id AND d.kind = 'return') AS returns
        FROM application a
        WHERE a.department_id = ${dept}::uuid
          AND (SELECT min(submitted_at) FROM application_revision WHERE application_id = a.id) AT TIME ZONE ${timeZone}
            >= ${FROM}::timestamp
          AND (SELECT min(submitted_at) FROM application_revision WHERE application_id = a.id) AT TIME ZONE ${timeZone}
            < ${addDays(TO, 1)}::timestamp`)
    ).rows;
    for (const t of r.returns) {
      const mine = rows.filter((x) => x.tier === t.tier);
      expect(t.applications).toBe(mine.length);
      expect(t.returns).toBe(mine.reduce((a, x) => a + x.returns, 0));
      expect(t.buckets).toEqual(
        [0, 1, 2]
          .map((n) => mine.filter((x) => x.returns === n).length)
          .concat(mine.filter((x) => x.returns >= 3).length),
      );
    }
    expect(r.returns.reduce((a, t) => a + t.applications, 0)).toBe(rows.length);
    // By hand: three tier-2 applications were first submitted in the range, returned 0, 1 and 3 times.
    expect(r.returns.find((t) => t.tier === 2)).toMatchObject({ applications: 3, returns: 4, buckets: [1, 1, 0, 1] });
  });

  it("counts active permits by tier and lists those ending within 90 days", async () => {
    const r = await report();
    const active = (
      await getDb().execute<{ tier: number; n: number }>(sql`
        SELECT p.tier, count(*)::int AS n FROM permit p JOIN application a ON a.id = p.application_id
        WHERE a.department_id = ${dept}::uuid AND p.state = 'active' AND p.valid_to >= ${today}::date GROUP BY p.tier`)
    ).rows;
    expect(r.active).toHaveLength(1);
    for (const t of [0, 1, 2, 3, 4] as const)
      expect(r.active[0].tiers[t]).toBe(active.find((a) => a.tier === t)?.n ?? 0);
    const ending = (
      await getDb().execute<{ number: string }>(sql`
        SELECT p.number FROM permit p JOIN application a ON a.id = p.application_id
        WHERE a.department_id = ${dept}::uuid AND p.state = 'active'
          AND p.valid_to >= ${today}::date AND p.valid_to < ${today}::date + 90 ORDER BY p.valid_to`)
    ).rows;
    expect(r.expiries.map((e) => e.number)).toEqual(ending.map((e) => e.number));
    // By hand: the tier-4 permit (10 days left) and the tier-2 one on day 89; day 90 is outside.
    expect(r.expiries.map((e) => e.daysLeft)).toEqual([10, 89]);
    expect(r.expiriesByWeek.reduce((a, w) => a + w.total, 0)).toBe(2);
  });

  it("counts incident and near-miss reports per month as this SQL does", async () => {
    const r = await report();
    // Independent of the report's query: each report's department by a CASE over scalar subqueries,
    // months by date_trunc on the institution's local time.
    const rows = (
      await getDb().execute<{ month: string; kind: string; injuries: boolean; n: number }>(sql`
        SELECT to_char(date_trunc('month', i.occurred_at AT TIME ZONE ${timeZone}), 'YYYY-MM') AS month,
          i.kind, i.injuries, count(*)::int AS n
        FROM incident i
        WHERE i.occurred_at AT TIME ZONE ${timeZone} >= ${FROM}::timestamp
          AND i.occurred_at AT TIME ZONE ${timeZone} < ${addDays(TO, 1)}::timestamp
          AND CASE
            WHEN i.permit_id IS NOT NULL THEN
              (SELECT a.department_id FROM permit p, application a WHERE p.id = i.permit_id AND a.id = p.application_id)
            WHEN i.apparatus_id IS NOT NULL THEN (SELECT department_id FROM apparatus WHERE id = i.apparatus_id)
            ELSE (SELECT department_id FROM app_user WHERE id = i.reporter_id)
          END = ${dept}::uuid
        GROUP BY 1, 2, 3`)
    ).rows;
    const sum = (month: string, keep: (x: (typeof rows)[number]) => boolean) =>
      rows.filter((x) => x.month === month && keep(x)).reduce((a, x) => a + x.n, 0);
    expect(r.incidents.map((m) => m.month)).toEqual(["2025-01", "2025-02", "2025-03", "2025-04", "2025-05", "2025-06"]);
    for (const m of r.incidents) {
      expect(m.incidents, m.month).toBe(sum(m.month, (x) => x.kind === "incident"));
      expect(m.nearMisses, m.month).toBe(sum(m.month, (x) => x.kind === "near_miss"));
      expect(m.injuries, m.month).toBe(sum(m.month, (x) => x.injuries));
      expect(m.total, m.month).toBe(sum(m.month, () => true));
    }
    // By hand: February one incident (someone hurt) and one near miss; June one near miss.
    expect(r.incidents.map((m) => m.total)).toEqual([0, 2, 0, 0, 0, 1]);
    expect(r.incidents.map((m) => m.injuries)).toEqual([0, 1, 0, 0, 0, 0]);
  });

  it("exports each chart as CSV with formulas neutralised, and refuses bad filters by their field", async () => {
    const q = `from=${FROM}&to=${TO}&department=${dept}`;
    const issued = await http(`/api/reports/export.csv?chart=issued&${q}`, { cookie: officerCookie });
    expect(issued.status).toBe(200);
    expect(issued.headers.get("content-type")).toContain("text/csv");
    const lines = issued.text.trim().split("\r\n");
    expect(lines[0]).toBe("month,tier_0,tier_1,tier_2,tier_3,tier_4,total");
    expect(lines[1]).toBe("2025-01,0,0,1,1,0,2");
    const active = await http(`/api/reports/export.csv?chart=active&${q}`, { cookie: officerCookie });
    // OWASP CSV injection: a leading = gets an apostrophe, and the quotes inside are doubled (RFC 4180).
    expect(active.text).toContain(`"'=HYPERLINK(""x"") ${u}"`);
    const incidentCsv = await http(`/api/reports/export.csv?chart=incidents&${q}`, { cookie: officerCookie });
    expect(incidentCsv.status).toBe(200);
    const incidentLines = incidentCsv.text.trim().split("\r\n");
    expect(incidentLines[0]).toBe("month,incidents,near_misses,with_injuries,total");
    expect(incidentLines[2]).toBe("2025-02,1,1,1,2");
    for (const [query, field] of [
      ["chart=pie", "chart"],
      [`chart=issued&from=2025-13-01`, "from"],
      [`chart=issued&from=2025-06-01&to=2025-01-01`, "to"],
      [`chart=issued&department=nope`, "department"],
      [`chart=issued&from=2010-01-01&to=2025-01-01`, "from"],
    ]) {
      const res = await http(`/api/reports/export.csv?${query}`, { cookie: officerCookie });
      expect(res.status, query).toBe(422);
      expect(
        res.json?.error.issues.map((i: { path: string }) => i.path),
        query,
      ).toContain(field);
    }
  });

  it("prints the whole report as a PDF that pdftotext reads", async () => {
    const res = await fetch(`${baseUrl()}/reports/pdf?from=${FROM}&to=${TO}&department=${dept}`, {
      headers: { cookie: officerCookie, "x-forwarded-for": randomIp() },
      redirect: "manual",
    });
    expect(res.status).toBe(200);
    const text = pdfText(Buffer.from(await res.arrayBuffer()));
    for (const heading of [
      "Permits issued per month",
      "Time to decision",
      "Returns per application",
      "Active permits",
      "Expiries in the next 90 days",
      "Incidents per month",
    ])
      // The PDF sets section headings in capitals.
      expect(text.toUpperCase()).toContain(heading.toUpperCase());
    const r = await report();
    expect(text).toContain(r.expiries[0].number);
    expect(text).toContain("12.0 h"); // tier 2's median, as the page prints it
    const table = reportTable(r, "issued");
    expect(text).toContain(String(table.rows[0][0]));
  });

  it("shows the page to an officer, with each chart's table", async () => {
    const page = await http(`/reports?from=${FROM}&to=${TO}&department=${dept}`, { cookie: officerCookie });
    expect(page.status).toBe(200);
    expect(page.text).toContain("Permits issued per month, by tier");
    expect(page.text).toContain("Incident and near-miss reports per month");
    const bad = await http(`/reports?from=2025-06-01&to=2025-01-01`, { cookie: officerCookie });
    expect(bad.text).toContain("The end is before the start.");
  });

  it("loads the charting library on /reports only", async () => {
    // Every script a page's HTML names; the chart library's own class name ("recharts-surface", the
    // SVG it draws) marks its code in a minified chunk.
    const chartCode = async (path: string) => {
      const page = await http(path, { cookie: officerCookie });
      expect(page.status, path).toBe(200);
      const sources = [...new Set([...page.text.matchAll(/<script[^>]+src="([^"]+)"/g)].map((m) => m[1]))];
      expect(sources.length, path).toBeGreaterThan(0);
      const bodies = await Promise.all(sources.map(async (src) => (await http(src)).text));
      return bodies.some((body) => body.includes("recharts-surface"));
    };
    expect(await chartCode(`/reports?from=${FROM}&to=${TO}&department=${dept}`)).toBe(true);
    for (const path of ["/", "/live", "/permits", "/incidents"]) expect(await chartCode(path), path).toBe(false);
  });
});
