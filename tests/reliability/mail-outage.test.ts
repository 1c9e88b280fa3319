import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { deliverDueMail, OUTBOX_POLICY } from "@/lib/mail/actions";
import { queueMail } from "@/lib/outbox";
import { smtpSettingsFromEnv } from "@/lib/mail/transport";
import { createUser, requireDatabase, uniq } from "../support/db";
import { baseUrl, http, signIn } from "../support/http";
import { caughtTo, closedPort, inboxPort, outboxRowsTo } from "../jobs/support";

requireDatabase();

// Issue 14: the mail server away for a whole day of clock time. The outbox is tried every 10 min of
// simulated time (the worker polls far more often; only due rows are tried) against a port nothing
// listens on, for 24 h; no row may give up. The local inbox page shows each waiting row's attempts
// and next try. When the server is back, each message is sent exactly once.
// Before this change a row failed for good after 20 attempts, about 14 h into an outage
// (30 s doubling to a 1 h cap: 1.06 h for the first 7, then one an hour).

const DAY_MS = 24 * 3_600_000;
const STEP_MS = 10 * 60_000;

describe("the mail server away for a day", () => {
  it(
    "loses nothing, shows its back-off on /dev/mail, and sends each message once when it returns",
    { timeout: 120_000 },
    async () => {
      const down = { ...smtpSettingsFromEnv(), port: await closedPort() };
      const up = { ...smtpSettingsFromEnv(), port: inboxPort() };
      const addresses = [1, 2, 3].map(() => `${uniq("away")}@example.test`);
      for (const to of addresses) {
        await getDb().transaction((tx) =>
          queueMail(tx, to, {
            kind: "invitation",
            data: {
              name: "A",
              invitedBy: "B",
              url: `${baseUrl()}/invite/${"y".repeat(43)}`,
              expiresAt: new Date().toISOString(),
            },
          }),
        );
      }
      const ids = (await outboxRowsTo(addresses)).map((r) => r.id);
      const t0 = Date.now();
      let attemptsSeen = 0;
      for (let t = t0; t < t0 + DAY_MS; t += STEP_MS) {
        const report = await deliverDueMail({ now: new Date(t), smtp: down, ids });
        expect(report.sent).toEqual([]);
        expect(report.failed).toEqual([]);
        attemptsSeen += report.retry.length;
      }
      const waiting = await outboxRowsTo(addresses);
      for (const row of waiting) {
        expect(row.status).toBe("queued");
        expect(row.lastError).toMatch(/ECONNREFUSED|ECONNECTION/);
      }
      const attempts = waiting[0].attempts;
      // 30 s · 2^(n−1) capped at 3600 s (OUTBOX_POLICY): 7 tries in the first 1.06 h, then hourly.
      expect(attempts).toBeGreaterThanOrEqual(25);
      expect(attempts).toBeLessThan(OUTBOX_POLICY.maxAttempts);
      expect(attemptsSeen).toBe(attempts * addresses.length);

      // The local inbox page shows the waiting rows with their attempts and next try.
      const admin = await createUser({ roles: ["admin"] });
      const page = await http("/dev/mail", { cookie: await signIn(admin.email) });
      expect(page.status).toBe(200);
      const html = page.text.replace(/<!-- -->/g, "");
      expect(html).toContain("Next try");
      for (const to of addresses) expect(html).toContain(to);

      // Back after the day: each message once, and a second flush sends nothing again.
      const back = await deliverDueMail({ now: new Date(t0 + DAY_MS + 3_600_000), smtp: up, ids });
      expect(back.sent.sort()).toEqual([...ids].sort());
      const again = await deliverDueMail({ now: new Date(t0 + DAY_MS + 2 * 3_600_000), smtp: up, ids });
      expect(again.sent).toEqual([]);
      for (const to of addresses) expect(caughtTo(to)).toHaveLength(1);
      console.log(
        `[mail outage] ${attempts} attempts per message over 24 h of simulated outage; all ${ids.length} sent once on return`,
      );
    },
  );
});
