// E-mail bodies and calendar text, without the network: every kind renders both parts with its link
// and its reason, user text is escaped, subjects stay on one line, and .ics output follows RFC 5545.
import { describe, expect, it } from "vitest";
import { renderEmail, type EmailContext } from "@/emails";
import { buildCalendar, escapeText, foldLine, permitEvents } from "@/lib/calendar/ics";
import { headerText, isPlainAddress, outboxMessageId } from "@/lib/outbox/headers";
import { defaultSubject, type MailMessage } from "@/lib/outbox";
import { TIER_GLYPHS } from "@/lib/tier-glyph";

const ctx: EmailContext = {
  appUrl: "https://permits.aldermere.example",
  institutionName: "Aldermere Institute of Technology",
  timeZone: "Europe/London",
  recipient: { address: "imogen@example.test", relation: "holder" },
};

const id = "0b6c1f2e-8f43-4a55-9d0e-5d9a3a1f7c21";
const permitId = "6f1d2b7a-1c3e-4f5a-8b9c-0d1e2f3a4b5c";
const title = "Belt generator <script>alert(1)</script> & spark gap";

const MESSAGES: MailMessage[] = [
  {
    kind: "invitation",
    data: {
      name: "Noor",
      invitedBy: "Sam Ferreira",
      url: `${ctx.appUrl}/invite/${"t".repeat(43)}`,
      expiresAt: "2026-05-12T10:00:00Z",
    },
  },
  {
    kind: "application_submitted",
    data: {
      applicationId: id,
      title,
      applicantName: "Imogen Tallis",
      tier: 2,
      departmentName: "Department of Physics",
    },
  },
  {
    kind: "application_returned",
    data: { applicationId: id, title, reviewerName: "Rafael Quenby", comment: "Add a bleeder." },
  },
  { kind: "application_recommended", data: { applicationId: id, title, reviewerName: "Rafael Quenby", tier: 3 } },
  {
    kind: "application_approved",
    data: {
      applicationId: id,
      permitId,
      permitNumber: "HV-2026-0007",
      title,
      validFrom: "2026-05-01",
      validTo: "2026-07-29",
      tier: 2,
      conditions: ["Barrier at 1.5 m"],
    },
  },
  {
    kind: "application_rejected",
    data: { applicationId: id, title, signerName: "Dana Whitlock", comment: "Not in a lecture hall." },
  },
  {
    kind: "permit_revoked",
    data: { permitId, permitNumber: "HV-2026-0007", title, reason: "Interlock bypassed.", signerName: "Dana Whitlock" },
  },
  {
    kind: "permit_reminder",
    data: { permitId, permitNumber: "HV-2026-0007", title, validTo: "2026-07-29", daysLeft: 7 },
  },
  {
    kind: "permit_reminder",
    data: {
      permitId,
      permitNumber: "HV-2026-0007",
      title,
      validTo: "2026-07-29",
      daysLeft: 0,
      recipient: "reviewer",
      holderName: "Imogen Tallis",
    },
  },
  {
    kind: "apparatus_changed",
    data: {
      apparatusId: id,
      apparatusName: "Capacitor bank, room B12",
      revision: 3,
      changedByName: "Imogen Tallis",
      recipient: "holder",
      permits: [
        {
          permitId,
          permitNumber: "HV-2026-0007",
          title,
          permitTier: 2,
          tier: 3,
          changes: ["Source 1 (C1): Capacitance: 500 nF → 1.00 µF"],
        },
      ],
    },
  },
  {
    kind: "training_reminder",
    data: { personName: "Imogen Tallis", course: title, lapsesOn: "2026-07-29", daysLeft: 7, recipient: "person" },
  },
  {
    kind: "pre_use_check_failed",
    data: {
      permitId,
      permitNumber: "HV-2026-0007",
      title,
      checkId: id,
      recordedByName: "Imogen Tallis",
      checkedAt: "2026-05-12T09:30:00Z",
      failed: [{ text: "Grounding hook inspected", note: "Clamp <b>cracked</b>" }],
      note: "",
      recipient: "officer",
    },
  },
  {
    kind: "incident_update",
    data: {
      incidentId: id,
      ref: "IR-12",
      summary: title,
      incidentKind: "near_miss",
      step: "closed",
      state: "closed",
      actorName: "Dana Whitlock",
      occurredAt: "2026-05-12T10:00:00Z",
      location: "B12 lecture theatre",
      injuries: false,
      findings: "The grounding hook was left on the far bench.",
      actions: "A second hook hangs beside the bank.",
      permitNumber: "HV-2026-0007",
      recipient: "reporter",
    },
  },
  {
    kind: "inspection_due",
    data: {
      apparatusId: id,
      apparatusName: title,
      room: "B12 lecture theatre",
      dueOn: "2026-02-09",
      lastInspectedOn: "2026-01-10",
      intervalDays: 30,
    },
  },
];

const LINK: Record<MailMessage["kind"], string> = {
  invitation: `/invite/${"t".repeat(43)}`,
  application_submitted: `/applications/${id}`,
  application_returned: `/applications/${id}`,
  application_recommended: `/applications/${id}`,
  application_approved: `/permits/${permitId}`,
  application_rejected: `/applications/${id}`,
  permit_revoked: `/permits/${permitId}`,
  permit_reminder: `/permits/${permitId}`,
  apparatus_changed: `/permits/${permitId}`,
  training_reminder: "/account",
  pre_use_check_failed: `/permits/${permitId}`,
  incident_update: `/incidents/${id}`,
  inspection_due: `/apparatus/${id}`,
};

describe("e-mail bodies", () => {
  it.each(
    MESSAGES.map((m) => [`${m.kind}${m.kind === "permit_reminder" ? ` (${m.data.daysLeft} days)` : ""}`, m] as const),
  )("%s: an HTML and a text part with the same link and a reason", (_, message) => {
    const { html, text } = renderEmail(message, ctx);
    const url = `${ctx.appUrl}${LINK[message.kind]}`;
    expect(html.startsWith('<!DOCTYPE html><html lang="en">')).toBe(true);
    expect(html).toContain(`href="${url}"`);
    expect(text).toContain(url);
    expect(text).toMatch(/You get this e-mail because/);
    expect(html).toMatch(/You get this e-mail because/);
    expect(text).toContain("Aldermere Institute of Technology");
    // User text is escaped in HTML, and no script survives.
    expect(html).not.toContain("<script>");
    if (message.kind !== "invitation") expect(html).toContain("&lt;script&gt;");
  });

  it("puts the note about the figures, not a CAUTION sign, in mails about a permit's use", () => {
    for (const kind of ["application_approved", "permit_revoked", "application_rejected"] as const) {
      const m = MESSAGES.find((x) => x.kind === kind)!;
      const { text, html } = renderEmail(m, ctx);
      expect(text).toContain("About these figures: The figures are an engineering estimate.");
      expect(text).toContain("De-energise and ground a set-up before anyone touches it.");
      expect(html).toContain('aria-label="About these figures"');
      // ANSI Z535.4-2007 §4.14.3: CAUTION means a hazard of minor or moderate injury, not a disclaimer.
      expect(text).not.toMatch(/caution/i);
    }
  });

  it("draws the tier glyph beside the tier in words (lib/tier-glyph.ts)", () => {
    const submitted = MESSAGES.find((x) => x.kind === "application_submitted")!;
    const { text, html } = renderEmail(submitted, ctx);
    const tier = (submitted.data as { tier: 0 | 1 | 2 | 3 | 4 }).tier;
    expect(html).toContain(`d="${TIER_GLYPHS[tier].numeral}"`);
    expect(text).toContain(`Tier ${tier} · `);
  });

  it("tells the holder and the signing reviewer different reasons for the expiry notice", () => {
    const reviewer = renderEmail(MESSAGES[8], ctx).text;
    expect(reviewer).toContain("you signed the review");
    expect(reviewer).toContain("held by Imogen Tallis");
    const holder = renderEmail(
      { ...MESSAGES[8], data: { ...MESSAGES[8].data, recipient: "holder" } } as MailMessage,
      ctx,
    ).text;
    expect(holder).toContain("you hold this permit");
  });

  // Issue 20, item 4: the bench card could not be found; the approval e-mail now links it in both sizes.
  it("offers the bench card in A4 and US Letter with the approval", () => {
    const approval = MESSAGES.find((m) => m.kind === "application_approved")!;
    const { html, text } = renderEmail(approval, ctx);
    for (const path of [`/permits/${permitId}/bench-card`, `/permits/${permitId}/bench-card?size=letter`]) {
      expect(text).toContain(`${ctx.appUrl}${path}`);
      expect(html).toContain(`href="${ctx.appUrl}${path.replace("&", "&amp;")}"`);
    }
    expect(text).toContain("Bench card (A4)");
    expect(text).toContain("Bench card (US Letter)");
  });

  it("prints permit days without a time zone shift and instants in the institution's zone", () => {
    const approved = renderEmail(MESSAGES[4], ctx).text;
    expect(approved).toContain("1 May 2026");
    expect(approved).toContain("29 July 2026 (the end of that day)");
    // 10:00 UTC on 12 May 2026 is 11:00 BST in London (IANA tzdata).
    expect(renderEmail(MESSAGES[0], ctx).text).toContain("12 May 2026 at 11:00 BST");
  });
});

describe("headers", () => {
  it("flattens CR, LF and other control characters in subjects to one line", () => {
    expect(headerText("a\r\nBcc: x@y.z\u2028c\u0000d")).toBe("a Bcc: x@y.z c d");
    expect(
      defaultSubject({
        kind: "application_rejected",
        data: { applicationId: id, title: "T\r\nX-Evil: 1", signerName: "S", comment: "" },
      }),
    ).toBe("Not approved: T X-Evil: 1");
    expect(headerText("x".repeat(300)).length).toBe(200);
  });

  it("accepts plain addresses only", () => {
    expect(isPlainAddress("imogen.tallis+permits@physics.aldermere.example")).toBe(true);
    for (const bad of ["a@b.c\r\nBcc: x@y.z", "Imogen <a@b.c>", "a b@c.d", "a@b", "@b.c", "a@-b.c"])
      expect(isPlainAddress(bad), bad).toBe(false);
  });

  it("gives an outbox row one Message-ID for every attempt, unique across database resets", () => {
    const a = outboxMessageId({ id: 7, createdAt: new Date("2026-05-01T10:00:00Z") }, "benchclear.test");
    expect(a).toBe(outboxMessageId({ id: 7, createdAt: new Date("2026-05-01T10:00:00Z") }, "benchclear.test"));
    expect(a).not.toBe(outboxMessageId({ id: 7, createdAt: new Date("2026-05-02T10:00:00Z") }, "benchclear.test"));
    expect(a).toMatch(/^<[^<>@\s]+@benchclear\.test>$/);
  });
});

describe("iCalendar (RFC 5545)", () => {
  it("escapes backslash, semicolon, comma and newlines in TEXT values", () => {
    // RFC 5545 §3.3.11: ESCAPED-CHAR = "\\" / "\;" / "\," / "\N" / "\n".
    expect(escapeText("a\\b;c,d\r\ne\nf")).toBe("a\\\\b\\;c\\,d\\ne\\nf");
  });

  it("folds lines at 75 octets without splitting a UTF-8 character", () => {
    // RFC 5545 §3.1: lines SHOULD NOT be longer than 75 octets; a fold is CRLF + one space.
    const line = `SUMMARY:${"Ω".repeat(60)}`;
    const folded = foldLine(line);
    for (const part of folded.split("\r\n")) expect(Buffer.byteLength(part, "utf8")).toBeLessThanOrEqual(75);
    expect(folded.replace(/\r\n /g, "")).toBe(line);
    expect(
      folded
        .split("\r\n")
        .slice(1)
        .every((p) => p.startsWith(" ")),
    ).toBe(true);
  });

  it("writes a permit as an all-day window with an exclusive end and a last-day event", () => {
    const ics = buildCalendar({
      name: "Permits",
      method: "PUBLISH",
      events: permitEvents(
        {
          id: permitId,
          number: "HV-2026-0007",
          title: "Sphere, gap; and \\ bank",
          validFrom: "2026-12-01",
          validTo: "2026-12-31",
          state: "active",
          updatedAt: new Date("2026-11-20T09:30:00Z"),
        },
        { appUrl: "https://permits.aldermere.example", domain: "aldermere.example" },
      ),
    });
    expect(ics.startsWith("BEGIN:VCALENDAR\r\nVERSION:2.0\r\n")).toBe(true);
    expect(ics.endsWith("END:VCALENDAR\r\n")).toBe(true);
    expect(ics.split("\r\n").every((l) => Buffer.byteLength(l, "utf8") <= 75)).toBe(true);
    const unfolded = ics.replace(/\r\n /g, "");
    // 31 December inclusive → DTEND 1 January of the next year.
    expect(unfolded).toContain("DTSTART;VALUE=DATE:20261201\r\nDTEND;VALUE=DATE:20270101");
    expect(unfolded).toContain("DTSTART;VALUE=DATE:20261231\r\nDTEND;VALUE=DATE:20270101");
    expect(unfolded).toContain("SUMMARY:Permit HV-2026-0007 valid: Sphere\\, gap\\; and \\\\ bank");
    expect(unfolded).toContain("DTSTAMP:20261120T093000Z");
    expect(unfolded).toContain(`UID:permit-${permitId}-window@aldermere.example`);
    expect(unfolded).toContain(`URL:https://permits.aldermere.example/permits/${permitId}`);
    expect(ics.match(/BEGIN:VEVENT/g)).toHaveLength(2);
  });

  it("marks a revoked permit's events cancelled", () => {
    const events = permitEvents(
      {
        id: permitId,
        number: "HV-1",
        title: "T",
        validFrom: "2026-01-01",
        validTo: "2026-01-02",
        state: "revoked",
        updatedAt: new Date(),
      },
      { appUrl: "http://x.test", domain: "x.test" },
    );
    expect(events.every((e) => e.status === "CANCELLED")).toBe(true);
  });
});
