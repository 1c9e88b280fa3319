import { eq, inArray } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications, decisions } from "@/db/schema";
// @ts-expect-error plain JavaScript helpers shared with the start and test scripts
import { pgStartAgain, pgStopFast } from "@/scripts/lib/services.mjs";
import { requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";
import { completeDraft, createDraft } from "../applications/support";
import { createSubmittedApplication, createTeam } from "../review/support";

requireDatabase();

// Issue 14, reliability: PostgreSQL restarted (pg_ctl stop -m fast, then start) under mixed load
// against the production build — reads, draft saves and decisions from three clients at once.
//   * every request answered 2xx is in the database afterwards;
//   * while the database is down, answers are 503 with Retry-After, never a 500 or a dropped
//     connection, and the server process keeps running;
//   * the app answers 2xx again within 5 s of the database being back, without a restart.
// The load runs for the 60 s (LOAD_MS); PostgreSQL stops 20 s in and is down for 3 s plus
// the time pg_ctl takes, so there are tens of seconds of load on each side of the outage. Decisions
// are paced (one about every 0.6 s plus the request) so that they last through the minute. The
// figures are printed for the closing note.

const LOAD_MS = 60_000;
const STOP_AT_MS = 20_000;
const DOWN_MS = 3_000;
const DECISION_PAUSE_MS = 600;

type Outcome = { kind: "read" | "save" | "decide"; status: number; at: number; retryAfter: string | null };

describe("PostgreSQL restarted under mixed load", () => {
  it(
    "keeps every acknowledged write, answers 503 while down and recovers by itself",
    { timeout: 240_000 },
    async () => {
      const team = await createTeam();
      const instructorCookie = await signIn(team.instructor.email);
      const reviewerCookie = await signIn(team.reviewer.email);
      // Decisions: tier-2 applications waiting for the reviewer, one decision each — a return, so that
      // they leave every queue afterwards (a recommendation would put 60 applications at the top of
      // every safety officer's queue for the test files that run after this one).
      const waiting: { id: string; version: number }[] = [];
      for (let i = 0; i < 60; i++) {
        waiting.push((await createSubmittedApplication({ applicant: team.instructor, tier: 2 })).application);
      }
      const drafts = [await createDraft(instructorCookie), await createDraft(instructorCookie)];

      const outcomes: Outcome[] = [];
      const ackedSaves = new Map<string, string>(); // draft id → last title answered 2xx
      const ackedDecisions: string[] = [];
      const t0 = Date.now();
      let downFrom = 0;
      let downTo = 0;
      let upAt = 0;
      const record = (kind: Outcome["kind"], res: { status: number; headers: Headers }) =>
        outcomes.push({ kind, status: res.status, at: Date.now(), retryAfter: res.headers.get("retry-after") });
      const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));
      const running = () => Date.now() - t0 < LOAD_MS;
      const safely = async <T>(call: () => Promise<T>): Promise<T | null> => {
        try {
          return await call();
        } catch {
          // A dropped connection counts as a failure of the test below (status 0).
          outcomes.push({ kind: "read", status: 0, at: Date.now(), retryAfter: null });
          return null;
        }
      };

      const reader = async () => {
        while (running()) {
          const res = await safely(() => http("/api/permits", { cookie: instructorCookie }));
          if (res) record("read", res);
          await pause(40);
        }
      };
      const saver = async () => {
        const versions = new Map(drafts.map((d) => [d.id, d.version]));
        let n = 0;
        while (running()) {
          const draft = drafts[n % drafts.length];
          const title = `Restart load ${n}`;
          const body = completeDraft(team.instructor, { title });
          const res = await safely(() =>
            http(`/api/applications/${draft.id}/draft`, {
              method: "PATCH",
              cookie: instructorCookie,
              body: { expectedVersion: versions.get(draft.id), step: 1, draft: body },
            }),
          );
          if (res) {
            record("save", res);
            if (res.status === 200) {
              versions.set(draft.id, res.json!.application.version);
              ackedSaves.set(draft.id, title);
            } else if (res.status === 409) {
              const fresh = await http(`/api/applications/${draft.id}/draft`, { cookie: instructorCookie });
              if (fresh.status === 200) versions.set(draft.id, fresh.json!.application.version);
            }
          }
          n++;
          await pause(60);
        }
      };
      const decider = async () => {
        for (const application of waiting) {
          if (!running()) break;
          for (;;) {
            const res = await safely(() =>
              http(`/api/review/${application.id}/decisions`, {
                method: "POST",
                cookie: reviewerCookie,
                body: { kind: "return", expectedVersion: application.version, comment: "Measure the gap again." },
              }),
            );
            if (res) record("decide", res);
            if (res && res.status >= 200 && res.status < 300) {
              ackedDecisions.push(application.id);
              break;
            }
            // 409: the decision was made by an earlier attempt whose answer was lost; count it as done.
            if (res?.status === 409 || !running()) break;
            await pause(100);
          }
          await pause(DECISION_PAUSE_MS);
        }
      };
      const restart = async () => {
        await pause(STOP_AT_MS);
        downFrom = Date.now();
        pgStopFast();
        downTo = Date.now();
        await pause(DOWN_MS);
        try {
          pgStartAgain();
        } finally {
          upAt = Date.now();
        }
      };

      try {
        await Promise.all([reader(), saver(), decider(), restart()]);
      } finally {
        if (!upAt) pgStartAgain();
      }

      const firstOkAfterUp = outcomes.find((o) => o.at > upAt && o.status >= 200 && o.status < 300);
      const whileDown = outcomes.filter((o) => o.at > downTo + 200 && o.at < upAt);
      const statuses = outcomes.reduce<Record<string, number>>(
        (acc, o) => ({ ...acc, [o.status]: (acc[o.status] ?? 0) + 1 }),
        {},
      );
      const recoveryMs = firstOkAfterUp ? firstOkAfterUp.at - upAt : Infinity;
      console.log(
        `[reliability] ${outcomes.length} requests in ${LOAD_MS / 1000} s; by status ${JSON.stringify(statuses)}; ` +
          `${whileDown.length} while PostgreSQL was down (${upAt - downFrom} ms from stop to ready, stop took ${downTo - downFrom} ms); ` +
          `first 2xx ${recoveryMs} ms after it was ready; ${ackedSaves.size} drafts and ${ackedDecisions.length} decisions acknowledged`,
      );

      // No 500s and no dropped connections, at any time.
      expect(outcomes.filter((o) => o.status === 0 || (o.status >= 500 && o.status !== 503))).toEqual([]);
      // While down: 503 with Retry-After, and there were such requests.
      expect(whileDown.length).toBeGreaterThan(5);
      for (const o of whileDown) {
        expect(o.status).toBe(503);
        expect(Number(o.retryAfter)).toBeGreaterThan(0);
      }
      for (const o of outcomes.filter((x) => x.status === 503)) expect(o.retryAfter).not.toBeNull();
      // Back within 5 s of the database, without restarting the app.
      expect(recoveryMs).toBeLessThan(5_000);

      // Every acknowledged write is in the database.
      const saved = await getDb()
        .select({ id: applications.id, title: applications.title, draft: applications.draft })
        .from(applications)
        .where(inArray(applications.id, [...ackedSaves.keys()]));
      for (const row of saved) {
        expect((row.draft as { event: { title: string } }).event.title).toBe(ackedSaves.get(row.id));
      }
      expect(ackedDecisions.length).toBeGreaterThan(5);
      const made = await getDb()
        .select({ applicationId: decisions.applicationId })
        .from(decisions)
        .where(inArray(decisions.applicationId, ackedDecisions));
      expect(new Set(made.map((d) => d.applicationId))).toEqual(new Set(ackedDecisions));
      const [state] = await getDb()
        .select({ state: applications.state })
        .from(applications)
        .where(eq(applications.id, ackedDecisions[0]));
      expect(state.state).toBe("returned");

      // The same server process still answers.
      expect((await http("/sign-in")).status).toBe(200);
    },
  );
});
