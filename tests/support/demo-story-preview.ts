// Run by tests/rules/preview-demo-story.test.ts in a child process, against a database of its own
// (DATABASE_URL, already migrated): puts the whole demo data in as `npm start` does
// (scripts/demo-data.ts), then previews each proposed tier rule set read from stdin (JSON: a list of
// { name, changes: [{ path, value }] } applied to the rules in force) as the demo's admin-officer would,
// and prints the demo records each preview lists, by title, as one JSON line. A database of its own,
// because the shared test database holds other tests' training requirements and rules, which the
// demo story's approvals (they name operators) would meet.
import "@/lib/jobs/standalone";

type Change = { path: [string, string | null]; value: number };
type Proposal = { name: string; changes: Change[] };

async function main() {
  const input = JSON.parse(
    await new Promise<string>((resolve) => {
      let text = "";
      process.stdin.on("data", (c) => (text += c));
      process.stdin.on("end", () => resolve(text));
    }),
  ) as Proposal[];
  const { seed } = await import("@/scripts/demo-data");
  const { closeDb, getDb } = await import("@/db");
  const { eq } = await import("drizzle-orm");
  const { applications, permits, users } = await import("@/db/schema");
  const { currentUserColumns } = await import("@/lib/auth/current-user");
  const { previewTierRules } = await import("@/lib/rules/preview");
  const { currentTierRuleSet } = await import("@/lib/rules/queries");
  const { thresholdAt, withThreshold } = await import("@/lib/rules/thresholds");

  await seed();
  const db = getDb();
  // The demo's officer, with admin added for the preview (it needs admin.rules; the officer's role
  // lets the preview show titles).
  const [officer] = await db.select(currentUserColumns).from(users).where(eq(users.email, "officer@benchclear.test"));
  const viewer = { ...officer, roles: [...officer.roles, "admin" as const] };
  const titles = new Map(
    (await db.select({ id: applications.id, title: applications.title }).from(applications)).map((a) => [
      a.id,
      a.title,
    ]),
  );
  const permitTitles = new Map(
    (
      await db
        .select({ id: permits.id, title: applications.title })
        .from(permits)
        .innerJoin(applications, eq(applications.id, permits.applicationId))
    ).map((p) => [p.id, p.title]),
  );
  const inForce = (await currentTierRuleSet()).rules;
  const today = new Date().toISOString().slice(0, 10);
  const out: Record<string, unknown> = { titles: [...titles.values()], rulesVersion: inForce.rulesVersion };
  for (const proposal of input) {
    let rules = inForce;
    for (const c of proposal.changes)
      rules = withThreshold(rules, c.path, { ...thresholdAt(inForce, c.path)!, value: c.value });
    const preview = await previewTierRules(viewer, { ...rules, rulesVersion: `demo-${proposal.name}` }, today);
    out[proposal.name] = {
      applications: preview.applications.map((m) => [titles.get(m.id), m.tierNow, m.tierNew]),
      permits: preview.permits.map((m) => [permitTitles.get(m.id), m.tierNow, m.tierNew]),
    };
  }
  out.rulesVersionAfter = (await currentTierRuleSet()).rules.rulesVersion;
  process.stdout.write(`\nPREVIEW ${JSON.stringify(out)}\n`);
  await closeDb();
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
