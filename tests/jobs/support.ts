// Fixtures for the mail and job tests: permits inserted straight into the test database (users, an
// application with a valid frozen revision and its assessment, a reviewer's signature, the permit),
// the local inbox's store (the JSON files scripts/local-inbox.ts writes), and child
// processes that run the worker code as a separate Node.js process.
import { spawn } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { applicationRevisions, applications, decisions, institutionSettings, mailOutbox, permits } from "@/db/schema";
import { assessSetup } from "@/lib/hazard";
import { sealDecision } from "@/lib/records/seal";
import { revisionHash } from "@/lib/signing/canonical";
import { applicationContentSchema, type ApplicationContent } from "@/lib/applications/schemas";
import { createDepartment, createUser, uniq } from "../support/db";

// A year no real permit uses, so fixture numbers never collide with permits the app issues.
const FIXTURE_YEAR = 2098;

export type PermitFixture = Awaited<ReturnType<typeof createPermitFixture>>;

export async function createPermitFixture(
  options: {
    validFrom?: string;
    validTo: string;
    issuedAt?: Date;
    state?: "active" | "expired" | "revoked";
    title?: string;
    holderName?: string;
    renewed?: boolean;
    tier0?: boolean;
  } = { validTo: "2098-12-31" },
) {
  const db = getDb();
  const dept = await createDepartment();
  const tag = uniq("p");
  const [holder, reviewer, operator] = await Promise.all([
    createUser({
      roles: ["instructor"],
      departmentId: dept.id,
      name: options.holderName,
      email: `${tag}-holder@example.test`,
    }),
    createUser({ roles: ["reviewer"], departmentId: dept.id, email: `${tag}-reviewer@example.test` }),
    createUser({ roles: ["instructor"], departmentId: dept.id, email: `${tag}-operator@example.test` }),
  ]);
  const validFrom = options.validFrom ?? "2098-01-01";
  const title = options.title ?? `Belt-charged sphere generator ${tag}`;
  const setup = { sources: [{ kind: "capacitor" as const, capacitance_F: 4.7e-9, voltage_V: 25_000 }] };
  const content: ApplicationContent = applicationContentSchema.parse({
    event: {
      title,
      kind: "lecture_demonstration",
      room: "B12",
      audience: "students",
      audienceSize: 40,
      firstDay: validFrom,
      lastDay: validFrom,
      responsible: { userId: holder.id, name: holder.name },
      operators: [{ userId: operator.id, name: operator.name, trained: true }],
    },
    apparatus: {
      apparatusId: null,
      apparatusRevisionId: null,
      name: "Sphere generator",
      room: "B12",
      notes: "",
      setup,
    },
    controls: { required: [], additional: "" },
    attachments: [],
    attestation: { accepted: true, text: "I confirm the description is complete and correct." },
  });
  const assessment = assessSetup(content.apparatus.setup);
  const tier = assessment.tier;
  const contentHash = revisionHash(content, assessment);

  return db.transaction(async (tx) => {
    const [application] = await tx
      .insert(applications)
      .values({
        title,
        applicantId: holder.id,
        departmentId: dept.id,
        state: "approved",
        tier,
        draft: content as unknown as Record<string, unknown>,
        namedUserIds: [operator.id],
        submittedAt: options.issuedAt ?? new Date(`${validFrom}T00:00:00Z`),
        decidedAt: options.issuedAt ?? new Date(`${validFrom}T00:00:00Z`),
      })
      .returning();
    const [revision] = await tx
      .insert(applicationRevisions)
      .values({
        applicationId: application.id,
        revision: 1,
        content: content as unknown as Record<string, unknown>,
        assessment,
        tier,
        contentHash,
        submittedById: holder.id,
      })
      .returning();
    await tx.update(applications).set({ currentRevisionId: revision.id }).where(eq(applications.id, application.id));
    if (!options.tier0) {
      await tx.insert(decisions).values(
        sealDecision({
          applicationId: application.id,
          revisionId: revision.id,
          kind: "recommend",
          step: 1,
          signerId: reviewer.id,
          signerName: reviewer.name,
          signerRole: "Reviewer",
          meaning: "Recommended for approval",
          contentHash,
        }),
      );
    }
    const counter = await tx.execute<{ last: number }>(
      sql`INSERT INTO permit_counter (year, last) VALUES (${FIXTURE_YEAR}, 1)
          ON CONFLICT (year) DO UPDATE SET last = permit_counter.last + 1 RETURNING last`,
    );
    const seq = Number(counter.rows[0].last);
    const [permit] = await tx
      .insert(permits)
      .values({
        number: `HV-${FIXTURE_YEAR}-${String(seq).padStart(4, "0")}`,
        year: FIXTURE_YEAR,
        seq,
        applicationId: application.id,
        revisionId: revision.id,
        holderId: holder.id,
        state: options.state ?? "active",
        tier,
        validFrom,
        validTo: options.validTo,
        conditions: ["Barrier at 1.5 m during operation"],
        verificationCode: uniq("v") + uniq("c"),
        issuedAt: options.issuedAt ?? new Date(`${validFrom}T00:00:00Z`),
        renewedByApplicationId: options.renewed ? application.id : null,
      })
      .returning();
    return { dept, holder, reviewer, operator, application, revision, permit, title };
  });
}

/** Sets the institution's time zone for a test and returns a function that puts the old one back. */
export async function useTimeZone(timeZone: string): Promise<() => Promise<void>> {
  const db = getDb();
  const [before] = await db.select().from(institutionSettings).limit(1);
  await db
    .insert(institutionSettings)
    .values({ id: 1, name: before?.name ?? "Aldermere Institute of Technology", timeZone })
    .onConflictDoUpdate({ target: institutionSettings.id, set: { timeZone } });
  return async () => {
    if (before)
      await db.update(institutionSettings).set({ timeZone: before.timeZone }).where(eq(institutionSettings.id, 1));
    else await db.delete(institutionSettings).where(eq(institutionSettings.id, 1));
  };
}

export async function outboxRowsTo(addresses: string[]) {
  if (addresses.length === 0) return [];
  return getDb()
    .select()
    .from(mailOutbox)
    .where(
      inArray(
        sql`lower(${mailOutbox.toAddress})`,
        addresses.map((a) => a.toLowerCase()),
      ),
    )
    .orderBy(mailOutbox.id);
}

// ---------------------------------------------------------------------------------------------
// The local inbox's store

export type Caught = {
  id: string;
  envelope: { from: string | null; to: string[] };
  messageId: string | null;
  subject: string;
  from: string;
  to: string;
  headers: Record<string, string>;
  text: string;
  html: string;
  attachments: { filename: string | null; contentType: string; size: number; content: string }[];
};

export function inboxDir(): string {
  const dir = process.env.LOCAL_INBOX_DIR;
  if (!dir) throw new Error("LOCAL_INBOX_DIR is not set: run the tests with `npm test`, which starts the local inbox.");
  return dir;
}

// A message file never changes once the inbox has renamed it into place (scripts/local-inbox.ts), so
// each is read and parsed once: tests poll caughtTo() every 100 ms for a dozen addresses at a time,
// and re-parsing the whole inbox (hundreds of messages by the end of a run) on every poll cost
// whole CPU seconds per poll.
const parsed = new Map<string, Caught>();

export function caughtTo(address: string): Caught[] {
  const dir = inboxDir();
  if (!fs.existsSync(dir)) return [];
  const wanted = address.toLowerCase();
  return fs
    .readdirSync(dir)
    .filter((n) => n.endsWith(".json"))
    .sort()
    .map((n) => {
      const file = path.join(dir, n);
      let message = parsed.get(file);
      if (!message) {
        message = JSON.parse(fs.readFileSync(file, "utf8")) as Caught;
        parsed.set(file, message);
      }
      return message;
    })
    .filter((m) => m.envelope.to.some((t) => t.toLowerCase() === wanted));
}

export function inboxPort(): number {
  const port = Number(process.env.SMTP_PORT);
  if (!port) throw new Error("SMTP_PORT is not set: run the tests with `npm test`, which starts the local inbox.");
  return port;
}

/** A TCP port on 127.0.0.1 with nothing listening: an SMTP server that is down. */
export async function closedPort(): Promise<number> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as net.AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

export async function waitFor<T>(
  probe: () => Promise<T | null | undefined> | T | null | undefined,
  timeoutMs = 20_000,
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

// ---------------------------------------------------------------------------------------------
// Separate worker processes

export type ChildResult = { code: number | null; signal: NodeJS.Signals | null; stdout: string; stderr: string };

/** Runs tests/jobs/fixtures/<script>.ts as its own Node.js process with the test environment. */
export function runChild(script: string, args: string[], env: Record<string, string> = {}): Promise<ChildResult> {
  return new Promise((resolve, reject) => {
    // Node itself with tsx as a loader (not the tsx CLI, which would run the script in a grandchild),
    // so a SIGKILL the script sends itself is what this process sees.
    const child = spawn(
      process.execPath,
      ["--import", "tsx", path.resolve("tests/jobs/fixtures", `${script}.ts`), ...args],
      {
        env: { ...process.env, ...env },
        stdio: ["ignore", "pipe", "pipe"],
      },
    );
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (d) => (stdout += d));
    child.stderr.on("data", (d) => (stderr += d));
    child.on("error", reject);
    child.on("exit", (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
}

/** The outbox rows queued to one address (to send just those with deliverDueMail({ ids })). */
export async function outboxIdsTo(address: string): Promise<number[]> {
  const rows = await getDb().select({ id: mailOutbox.id }).from(mailOutbox).where(eq(mailOutbox.toAddress, address));
  return rows.map((r) => r.id);
}
