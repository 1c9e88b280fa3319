// The outbox against the real local inbox (scripts/local-inbox.ts, started by `npm test`):
// every kind of mail reaches its recipient with an HTML and a text part and links that open the
// right page; header injection through titles and names is neutralised; an SMTP server that is down
// delays mail and loses none; concurrent and crashing workers never send a message twice.
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { mailOutbox } from "@/db/schema";
import { startWorker } from "@/lib/jobs/worker";
import { deliverDueMail } from "@/lib/mail/actions";
import { outboxMessageId, senderDomain } from "@/lib/outbox/headers";
import { queueMail, type MailMessage } from "@/lib/outbox";
import { smtpSettingsFromEnv } from "@/lib/mail/transport";
import { inviteUser } from "@/lib/users/actions";
import { createUser, requireDatabase, uniq } from "../support/db";
import { baseUrl, http, signIn } from "../support/http";
import {
  caughtTo,
  inboxPort,
  closedPort,
  createPermitFixture,
  outboxRowsTo,
  runChild,
  waitFor,
  type Caught,
} from "../jobs/support";

requireDatabase();

async function queue(to: string | string[], message: MailMessage, dedupeKey?: string) {
  return getDb().transaction((tx) => queueMail(tx, to, message, { dedupeKey }));
}

function links(text: string): URL[] {
  return [...text.matchAll(/https?:\/\/[^\s<>"]+/g)].map((m) => new URL(m[0]));
}

function ofKind(address: string, kind: string): Caught[] {
  return caughtTo(address).filter((m) => m.headers["x-benchclear-kind"] === kind);
}

// The files of one copy of the test set-up run one after another, and most of them leave their mail
// in the outbox (nothing sends it in the test server). deliverDueMail() sends every due row, so send
// that backlog first: each case below then waits for its own mail only, and a case that runs out of
// time cannot leave a send running into the next one.
beforeAll(async () => {
  await deliverDueMail({ limit: 100_000 });
}, 300_000);

describe("every kind of mail, through the real inbox", () => {
  it("reaches the right recipient with an HTML and a text part, says why, and links to the right page", async () => {
    const f = await createPermitFixture({ validFrom: "2098-03-01", validTo: "2098-05-29" });
    const officer = await createUser({ roles: ["safety_officer"] });
    const admin = await createUser({ roles: ["admin"] });
    const invitee = `${uniq("invitee")}@example.test`;
    const appPath = `/applications/${f.application.id}`;
    const permitPath = `/permits/${f.permit.id}`;

    // The invitation through the real event (an admin invites someone).
    await inviteUser(
      { id: admin.id, email: admin.email, name: admin.name, roles: admin.roles, departmentId: null },
      {
        email: invitee,
        name: "Noor Halden",
        roles: ["instructor"],
        departmentId: null,
      },
    );
    const common = { applicationId: f.application.id, title: f.title };
    await queue(f.reviewer.email, {
      kind: "application_submitted",
      data: { ...common, applicantName: f.holder.name, tier: f.permit.tier },
    });
    await queue(f.holder.email, {
      kind: "application_returned",
      data: { ...common, reviewerName: f.reviewer.name, comment: "Add the bleeder.\nAnd the barrier." },
    });
    await queue(officer.email, {
      kind: "application_recommended",
      data: { ...common, reviewerName: f.reviewer.name, tier: f.permit.tier },
    });
    await queue(f.holder.email, {
      kind: "application_approved",
      data: {
        ...common,
        permitId: f.permit.id,
        permitNumber: f.permit.number,
        validFrom: f.permit.validFrom,
        validTo: f.permit.validTo,
      },
    });
    await queue(f.holder.email, {
      kind: "application_rejected",
      data: { ...common, signerName: officer.name, comment: "Not with an audience." },
    });
    await queue([f.holder.email, f.operator.email], {
      kind: "permit_revoked",
      data: {
        permitId: f.permit.id,
        permitNumber: f.permit.number,
        title: f.title,
        reason: "Interlock found bypassed.",
        signerName: officer.name,
      },
    });
    await queue(f.holder.email, {
      kind: "permit_reminder",
      data: {
        permitId: f.permit.id,
        permitNumber: f.permit.number,
        title: f.title,
        validTo: f.permit.validTo,
        daysLeft: 7,
        recipient: "holder",
      },
    });

    const report = await deliverDueMail({ limit: 10_000 });
    expect(report.failed).toEqual([]);

    const expected: { to: string; kind: string; path: string | RegExp; reason: RegExp }[] = [
      { to: invitee, kind: "invitation", path: /^\/invite\/[A-Za-z0-9_-]{43}$/, reason: /entered this address/ },
      {
        to: f.reviewer.email,
        kind: "application_submitted",
        path: appPath,
        reason: new RegExp(`you review applications for ${f.dept.name}`),
      },
      { to: f.holder.email, kind: "application_returned", path: appPath, reason: /you submitted this application/ },
      { to: officer.email, kind: "application_recommended", path: appPath, reason: /you are a safety officer/ },
      { to: f.holder.email, kind: "application_approved", path: permitPath, reason: /you hold this permit/ },
      { to: f.holder.email, kind: "application_rejected", path: appPath, reason: /you submitted this application/ },
      { to: f.holder.email, kind: "permit_revoked", path: permitPath, reason: /you hold this permit/ },
      { to: f.operator.email, kind: "permit_revoked", path: permitPath, reason: /you are named on this permit/ },
      { to: f.holder.email, kind: "permit_reminder", path: permitPath, reason: /you hold this permit/ },
    ];
    const cookies = new Map<string, string>();
    for (const e of expected) {
      const mails = ofKind(e.to, e.kind);
      expect(mails, `${e.kind} → ${e.to}`).toHaveLength(1);
      const [mail] = mails;
      expect(mail.html, e.kind).toMatch(/^<!DOCTYPE html>/);
      expect(mail.text.length, e.kind).toBeGreaterThan(100);
      expect(mail.text, e.kind).toMatch(e.reason);
      expect(mail.html, e.kind).toMatch(e.reason);
      // The link in the text part is in the HTML part too, and it is an address of this app.
      const link = links(mail.text).find((u) => u.origin === new URL(baseUrl()).origin && u.pathname !== "/");
      expect(link, `${e.kind}: a link into the app`).toBeDefined();
      expect(mail.html).toContain(`href="${link!.toString()}"`);
      if (typeof e.path === "string") expect(link!.pathname).toBe(e.path);
      else expect(link!.pathname).toMatch(e.path);
      // The link works: the page answers 200 for the recipient (the invitation page needs no sign-in).
      let cookie: string | undefined;
      if (e.kind !== "invitation") {
        if (!cookies.has(e.to)) cookies.set(e.to, await signIn(e.to));
        cookie = cookies.get(e.to);
      }
      const page = await http(link!.pathname, { cookie });
      expect(page.status, `${e.kind}: GET ${link!.pathname}`).toBe(200);
    }

    // Nobody else got these: the operator only the revocation, the officer only the recommendation.
    expect(caughtTo(f.operator.email).map((m) => m.headers["x-benchclear-kind"])).toEqual(["permit_revoked"]);
    expect(caughtTo(officer.email).map((m) => m.headers["x-benchclear-kind"])).toEqual(["application_recommended"]);
    // The return comments are quoted in both parts.
    const returned = ofKind(f.holder.email, "application_returned")[0];
    expect(returned.text).toContain("> Add the bleeder.\n> And the barrier.");
    expect(returned.html).toContain("Add the bleeder.");
  });

  it("attaches the permit PDF and a calendar file with the validity window to the approval", async () => {
    const f = await createPermitFixture({ validFrom: "2098-03-01", validTo: "2098-05-29" });
    await queue(f.holder.email, {
      kind: "application_approved",
      data: {
        applicationId: f.application.id,
        permitId: f.permit.id,
        permitNumber: f.permit.number,
        title: f.title,
        validFrom: f.permit.validFrom,
        validTo: f.permit.validTo,
      },
    });
    await deliverDueMail({ limit: 10_000 });
    const [mail] = ofKind(f.holder.email, "application_approved");
    const ics = mail.attachments.find((a) => a.filename === `${f.permit.number}.ics`);
    expect(ics?.contentType).toBe("text/calendar");
    const body = Buffer.from(ics!.content, "base64").toString("utf8");
    // RFC 5545: all-day window 1 March to 29 May inclusive → DTEND is the exclusive 30 May.
    expect(body).toContain("DTSTART;VALUE=DATE:20980301\r\n");
    expect(body).toContain("DTEND;VALUE=DATE:20980530\r\n");
    expect(body).toContain(`UID:permit-${f.permit.id}-window@`);
    // The approval prints the permit's conditions and room, read from the permit.
    expect(mail.text).toContain("Barrier at 1.5 m during operation");
    expect(mail.text).toContain("B12");
    const pdf = mail.attachments.find((a) => a.contentType === "application/pdf");
    expect(pdf?.filename).toMatch(/\.pdf$/);
    expect(Buffer.from(pdf!.content, "base64").subarray(0, 5).toString()).toBe("%PDF-");
  });
});

describe("header injection", () => {
  it("a title and names with CR/LF never produce extra headers or recipients", async () => {
    const f = await createPermitFixture({ validFrom: "2098-03-01", validTo: "2098-05-29" });
    const intruder = `${uniq("intruder")}@example.test`;
    const evil = `Bench demo\r\nBcc: ${intruder}\r\nX-Injected: yes\r\n\r\n<b>body</b>`;
    await queue(f.holder.email, {
      kind: "application_rejected",
      data: {
        applicationId: f.application.id,
        title: evil,
        signerName: `Mallory\nCc: ${intruder}`,
        comment: "No.\r\n.\r\nRSET",
      },
    });
    // A recipient address carrying a header is refused outright (stored rows are plain addresses).
    await queue(`${f.operator.email}\r\nBcc: ${intruder}`, {
      kind: "application_rejected",
      data: { applicationId: f.application.id, title: "x", signerName: "y", comment: "z" },
    });
    const report = await deliverDueMail({ limit: 10_000 });
    const [mail] = ofKind(f.holder.email, "application_rejected");
    expect(mail.subject).toBe(`Not approved: Bench demo Bcc: ${intruder} X-Injected: yes <b>body</b>`);
    expect(mail.headers["x-injected"]).toBeUndefined();
    expect(mail.headers.bcc).toBeUndefined();
    expect(mail.headers.cc).toBeUndefined();
    expect(mail.envelope.to).toEqual([f.holder.email]);
    expect(caughtTo(intruder)).toEqual([]);
    // The SMTP dot in the comment stayed in the body (dot-stuffed on the wire), and the HTML is escaped.
    expect(mail.text).toContain("> No.\n> .\n> RSET");
    expect(mail.html).not.toContain("<b>body</b>");
    expect(mail.html).toContain("&lt;b&gt;body&lt;/b&gt;");
    const [refused] = await getDb()
      .select()
      .from(mailOutbox)
      .where(eq(mailOutbox.toAddress, `${f.operator.email}\r\nBcc: ${intruder}`));
    expect(refused.status).toBe("failed");
    expect(report.failed).toContain(refused.id);
  });
});

describe("when SMTP fails", () => {
  it("a server that is down delays mail and loses none: each row is sent once it is back", async () => {
    const down = { ...smtpSettingsFromEnv(), port: await closedPort() };
    const up = { ...smtpSettingsFromEnv(), port: inboxPort() };
    const addresses = [1, 2, 3].map(() => `${uniq("outage")}@example.test`);
    for (const to of addresses)
      await queue(to, {
        kind: "invitation",
        data: {
          name: "A",
          invitedBy: "B",
          url: `${baseUrl()}/invite/${"z".repeat(43)}`,
          expiresAt: new Date().toISOString(),
        },
      });
    const rows = await outboxRowsTo(addresses);
    const t0 = new Date();

    const first = await deliverDueMail({ now: t0, smtp: down });
    expect(first.sent).toEqual([]);
    for (const row of await outboxRowsTo(addresses)) {
      expect(row.status).toBe("queued");
      expect(row.attempts).toBe(1);
      expect(row.lastError).toMatch(/ECONNREFUSED|ECONNECTION/);
    }
    // Within the back-off (30 s after the first attempt) nothing is tried, even with the server up.
    const early = await deliverDueMail({ now: new Date(t0.getTime() + 10_000), smtp: up });
    expect(early.sent.filter((id) => rows.some((r) => r.id === id))).toEqual([]);
    // Still down at the second attempt: the back-off doubles to 60 s.
    await deliverDueMail({ now: new Date(t0.getTime() + 31_000), smtp: down });
    for (const row of await outboxRowsTo(addresses)) expect(row.attempts).toBe(2);
    const back = await deliverDueMail({ now: new Date(t0.getTime() + 31_000 + 61_000), smtp: up });
    expect(back.sent).toEqual(expect.arrayContaining(rows.map((r) => r.id)));
    for (const row of await outboxRowsTo(addresses)) {
      expect(row.status).toBe("sent");
      expect(row.attempts).toBe(3);
      expect(row.lastError).toBeNull();
    }
    for (const to of addresses) expect(caughtTo(to)).toHaveLength(1);
  });

  it("the pg-boss worker retries on its own and delivers once the server returns", async () => {
    let smtp = { ...smtpSettingsFromEnv(), port: await closedPort() };
    const worker = await startWorker({
      schedule: false,
      pollMs: 200,
      smtp: () => smtp,
      backoff: { baseSeconds: 1, capSeconds: 2 },
      log: () => {},
    });
    try {
      const to = `${uniq("outage")}@example.test`;
      await queue(to, {
        kind: "invitation",
        data: {
          name: "A",
          invitedBy: "B",
          url: `${baseUrl()}/invite/${"z".repeat(43)}`,
          expiresAt: new Date().toISOString(),
        },
      });
      await waitFor(async () => ((await outboxRowsTo([to]))[0]?.attempts ?? 0) >= 2);
      expect(caughtTo(to)).toEqual([]);
      smtp = { ...smtp, port: inboxPort() };
      // The row is marked sent just before the final dot; the local inbox has the message a moment later.
      await waitFor(() => caughtTo(to).length === 1);
      const [row] = await outboxRowsTo([to]);
      expect(row.status).toBe("sent");
      expect(row.attempts).toBeGreaterThanOrEqual(3);
      expect(row.lastError).toBeNull();
      expect(caughtTo(to)).toHaveLength(1);
    } finally {
      await worker.stop();
    }
  });

  it("a permanently failing row is marked failed after the last attempt, with its error", async () => {
    const to = `${uniq("doomed")}@example.test`;
    await queue(to, {
      kind: "invitation",
      data: { name: "A", invitedBy: "B", url: `${baseUrl()}/invite/x`, expiresAt: new Date().toISOString() },
    });
    const down = { ...smtpSettingsFromEnv(), port: await closedPort() };
    const t0 = Date.now();
    for (let i = 0; i < 3; i++) await deliverDueMail({ now: new Date(t0 + i * 3_600_000), smtp: down, maxAttempts: 3 });
    const [row] = await outboxRowsTo([to]);
    expect(row.status).toBe("failed");
    expect(row.attempts).toBe(3);
    expect(row.lastError).toMatch(/ECONNREFUSED|ECONNECTION/);
  });
});

describe("concurrent and crashing workers", () => {
  it("two workers flushing at once send each row once, with the row's stable Message-ID", async () => {
    const addresses = Array.from({ length: 12 }, () => `${uniq("pair")}@example.test`);
    for (const to of addresses)
      await queue(to, {
        kind: "invitation",
        data: { name: "A", invitedBy: "B", url: `${baseUrl()}/invite/x`, expiresAt: new Date().toISOString() },
      });
    const [a, b] = await Promise.all([deliverDueMail({ limit: 10_000 }), deliverDueMail({ limit: 10_000 })]);
    const rows = await outboxRowsTo(addresses);
    const ids = rows.map((r) => r.id);
    const sentBy = [...a.sent, ...b.sent].filter((id) => ids.includes(id));
    expect(sentBy.sort()).toEqual([...ids].sort());
    const domain = senderDomain(process.env.MAIL_FROM ?? "Benchclear <no-reply@benchclear.test>");
    for (const row of rows) {
      const caught = caughtTo(row.toAddress);
      expect(caught).toHaveLength(1);
      expect(caught[0].messageId).toBe(outboxMessageId(row, domain));
    }
  });

  it("a worker killed after the server accepted: the row is already sent, a new worker sends nothing again", async () => {
    const to = `${uniq("crash")}@example.test`;
    await queue(to, {
      kind: "invitation",
      data: { name: "A", invitedBy: "B", url: `${baseUrl()}/invite/x`, expiresAt: new Date().toISOString() },
    });
    const [row] = await outboxRowsTo([to]);
    const killed = await runChild("worker-child", ["--deliver", "--kill-at", "accepted", "--rows", String(row.id)]);
    expect(killed.signal).toBe("SIGKILL");
    expect((await outboxRowsTo([to]))[0].status).toBe("sent");
    await deliverDueMail({ limit: 10_000 });
    expect(caughtTo(to)).toHaveLength(1);
  });

  it("a worker killed before its commit: the server discarded the unfinished message, the retry sends it once", async () => {
    const to = `${uniq("crash")}@example.test`;
    await queue(to, {
      kind: "invitation",
      data: { name: "A", invitedBy: "B", url: `${baseUrl()}/invite/x`, expiresAt: new Date().toISOString() },
    });
    const [row] = await outboxRowsTo([to]);
    const killed = await runChild("worker-child", ["--deliver", "--kill-at", "data", "--rows", String(row.id)]);
    expect(killed.signal).toBe("SIGKILL");
    expect(caughtTo(to)).toEqual([]);
    expect((await outboxRowsTo([to]))[0].status).toBe("queued");
    await deliverDueMail({ limit: 10_000 });
    expect(caughtTo(to)).toHaveLength(1);
    expect((await outboxRowsTo([to]))[0].status).toBe("sent");
  });

  it("a worker killed between its commit and the final dot loses that one message: the documented window, never a duplicate", async () => {
    // lib/mail/actions.ts chooses at most once: the row is marked sent in the transaction that
    // commits just before the final "<CRLF>.<CRLF>" is written. Dying in that instant (forced here
    // by the test) leaves a row that says sent and a server that discarded the unfinished message.
    const to = `${uniq("crash")}@example.test`;
    await queue(to, {
      kind: "invitation",
      data: { name: "A", invitedBy: "B", url: `${baseUrl()}/invite/x`, expiresAt: new Date().toISOString() },
    });
    const [row] = await outboxRowsTo([to]);
    const killed = await runChild("worker-child", ["--deliver", "--kill-at", "committed", "--rows", String(row.id)]);
    expect(killed.signal).toBe("SIGKILL");
    await deliverDueMail({ limit: 10_000 });
    expect((await outboxRowsTo([to]))[0].status).toBe("sent");
    expect(caughtTo(to)).toEqual([]);
  });
});
