// /dev/mail and its API over HTTP against the production build (MAIL_TRANSPORT=local-inbox in tests):
// an admin sees each caught message with its HTML in a sandboxed frame and its text part.
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { deliverDueMail } from "@/lib/mail/actions";
import { queueMail } from "@/lib/outbox";
import { createUser, requireDatabase, uniq } from "../support/db";
import { baseUrl, http, signIn } from "../support/http";
import { caughtTo, outboxIdsTo } from "../jobs/support";

requireDatabase();

describe("/dev/mail", () => {
  it("lists caught mail for admins and shows one message's HTML (sandboxed) and text", async () => {
    const admin = await createUser({ roles: ["admin"] });
    const cookie = await signIn(admin.email);
    const to = `${uniq("devmail")}@example.test`;
    await getDb().transaction((tx) =>
      queueMail(tx, to, {
        kind: "invitation",
        data: {
          name: "Noor <b>Halden</b>",
          invitedBy: "Sam",
          url: `${baseUrl()}/invite/${"q".repeat(43)}`,
          expiresAt: new Date().toISOString(),
        },
      }),
    );
    // Other test files leave mail queued in the shared outbox: send just this message.
    await deliverDueMail({ ids: await outboxIdsTo(to) });
    const [caught] = caughtTo(to);

    const list = await http("/api/dev/mail", { cookie });
    expect(list.status).toBe(200);
    const summary = (
      list.json!.messages as { id: string; envelope: { to: string[] }; kind: string; deliveries: number }[]
    ).find((m) => m.envelope.to.includes(to));
    expect(summary).toMatchObject({ id: caught.id, kind: "invitation", deliveries: 1 });
    expect(list.json!.outbox.counts.sent).toBeGreaterThan(0);

    const one = await http(`/api/dev/mail/${caught.id}`, { cookie });
    expect(one.status).toBe(200);
    expect(one.json!.text).toContain("/invite/");
    expect(one.json!.html).toContain("Noor &lt;b&gt;Halden&lt;/b&gt;");
    expect(JSON.stringify(one.json!.attachments)).not.toContain("content");

    const page = await http(`/dev/mail?id=${caught.id}`, { cookie });
    expect(page.status).toBe(200);
    const iframe = /<iframe[^>]*>/.exec(page.text)?.[0] ?? "";
    expect(iframe).toMatch(/sandbox=""/);
    expect(iframe).toMatch(/srcdoc="&lt;!DOCTYPE html&gt;/i);
    expect(page.text).toContain("You are invited to Benchclear");
    expect((await http("/api/dev/mail/..%2F..%2Fetc%2Fpasswd", { cookie })).status).toBe(404);
    expect((await http("/api/dev/mail/1700000000000-zzzzzzzz", { cookie })).status).toBe(404);
  });
});
