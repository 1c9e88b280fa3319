// Re-review when an apparatus changes (issue 17, item 4): an edit of an apparatus under an active
// permit is recorded against the permit, shown as "apparatus changed since approval" with the field
// diff and the new tier, mailed once per person, and the holder can start an amendment.
import { and, eq, like } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { applications, auditEvents, mailOutbox, permitApparatusChanges, permits } from "@/db/schema";
import { requiredControls, type SetupInput } from "@/lib/hazard";
import { requireDatabase, TEST_PASSWORD } from "../support/db";
import { http, signIn } from "../support/http";
import { permitOverApparatus } from "./support";

requireDatabase();

/**
 * The edit: the bank swapped for 1 µF charged to 10 kV. By hand, E = ½·C·V² = ½ × 1e-6 F × (1e4 V)²
 * = 50 J (the textbook capacitor energy, worked here without the engine); 50 J at 10 kV is at or above
 * the 10 J at ≥ 100 V line of tier 3 in hazard-model.md's default table (from the LBNL Electrical Safety
 * Manual's capacitor hazard classes, as hazard-references.md cites them).
 */
const BIGGER_BANK: SetupInput = {
  sources: [{ id: "C1", kind: "capacitor", capacitance_F: 1e-6, voltage_V: 10_000, bleeder_ohm: 100e6 }],
};

/** Page text without tags, comments or entity noise, for reading what a person sees. */
function visibleText(html: string): string {
  return html
    .replace(/<!--.*?-->/g, "")
    .replace(/<script[\s\S]*?<\/script>/g, " ")
    .replace(/<[^>]+>/g, " ")
    .replace(/&#x27;|&rsquo;|&#39;/g, "'")
    .replace(/&amp;/g, "&")
    .replace(/\s+/g, " ");
}

async function edit(cookie: string, id: string, expectedRevision: number, setup: SetupInput, notes = "") {
  return http(`/api/apparatus/${id}`, {
    method: "PATCH",
    cookie,
    body: { name: "Jar bank, enlarged", room: "B12", notes, setup, expectedRevision },
  });
}

async function mailsFor(revisionId: string) {
  return getDb()
    .select({ to: mailOutbox.toAddress, kind: mailOutbox.kind, subject: mailOutbox.subject, data: mailOutbox.data })
    .from(mailOutbox)
    .where(like(mailOutbox.dedupeKey, `apparatus_changed:${revisionId}:%`));
}

describe("re-review when an apparatus changes under an active permit", () => {
  it("an apparatus edit under an active permit producing the banner, the diff and one e-mail per person", async () => {
    const { team, cookie, apparatusId, permit } = await permitOverApparatus();

    const saved = await edit(cookie, apparatusId, 1, BIGGER_BANK);
    expect(saved.status, saved.text).toBe(200);
    expect(saved.json!.apparatus.permitsFlagged).toEqual([
      { permitId: permit.id, permitNumber: permit.number, permitTier: 1, tier: 3 },
    ]);
    const revisionId = saved.json!.apparatus.revisionId as string;

    // The permit itself is untouched: still active, still tier 1.
    const [stored] = await getDb().select().from(permits).where(eq(permits.id, permit.id));
    expect(stored.state).toBe("active");
    expect(stored.tier).toBe(1);
    const changes = await getDb()
      .select()
      .from(permitApparatusChanges)
      .where(eq(permitApparatusChanges.permitId, permit.id));
    expect(changes.map((c) => [c.revision, c.permitTier, c.tier])).toEqual([[2, 1, 3]]);
    const audit = await getDb()
      .select({ data: auditEvents.data })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, permit.id), eq(auditEvents.action, "permit.apparatus_changed")));
    expect(audit).toHaveLength(1);

    // One e-mail per person: the holder and each safety officer, nobody twice, the reviewer not at all.
    const mails = await mailsFor(revisionId);
    const addresses = mails.map((m) => m.to.toLowerCase());
    expect(new Set(addresses).size).toBe(addresses.length);
    for (const person of [team.instructor, team.officer, team.officer2]) {
      expect(addresses.filter((a) => a === person.email.toLowerCase())).toHaveLength(1);
    }
    expect(addresses).not.toContain(team.reviewer.email.toLowerCase());
    const holderMail = mails.find((m) => m.to.toLowerCase() === team.instructor.email.toLowerCase())!;
    expect(holderMail.kind).toBe("apparatus_changed");
    expect(holderMail.subject).toContain(permit.number);
    expect((holderMail.data as { recipient: string }).recipient).toBe("holder");
    const officerMail = mails.find((m) => m.to.toLowerCase() === team.officer.email.toLowerCase())!;
    expect((officerMail.data as { recipient: string }).recipient).toBe("officer");

    // The banner on the permit page: the diff with units and the new tier, marked higher.
    const page = await http(`/permits/${permit.id}`, { cookie });
    expect(page.status).toBe(200);
    const text = visibleText(page.text);
    expect(text).toContain("Apparatus changed since approval");
    // 0.45 µF → 1 µF and 100 V → 10 kV, as typed; the stored energy ½·C·V² by hand:
    // ½ × 0.45e-6 F × (100 V)² = 2.25 mJ before, ½ × 1e-6 F × (1e4 V)² = 50 J after.
    expect(text).toMatch(/Capacitance 450 nF → 1\.00 µF/);
    expect(text).toMatch(/Voltage 100 V → 10\.0 kV/);
    expect(text).toMatch(/Stored energy 2\.25 mJ → 50\.0 J/);
    expect(text).toMatch(/now assessed at Tier 3/);
    expect(text).toMatch(/Higher than the permit.s tier 1/);
    expect(text).toContain("Start an amendment");
    // An officer sees the banner too, without the holder's amendment button.
    const officerPage = await http(`/permits/${permit.id}`, { cookie: await signIn(team.officer.email) });
    expect(visibleText(officerPage.text)).toContain("Apparatus changed since approval");
    expect(visibleText(officerPage.text)).not.toContain("Start an amendment");

    // The holder's dashboard lists it.
    const dashboard = visibleText((await http("/", { cookie })).text);
    expect(dashboard).toContain("Apparatus changed since approval");
    expect(dashboard).toContain(permit.number);

    // A second change is a second e-mail per person; the first change is never mailed again.
    const again = await edit(cookie, apparatusId, 2, BIGGER_BANK, "Bleeder checked.");
    expect(again.status, again.text).toBe(200);
    const second = await mailsFor(again.json!.apparatus.revisionId);
    expect(second.filter((m) => m.to.toLowerCase() === team.instructor.email.toLowerCase())).toHaveLength(1);
    expect(second.filter((m) => m.to.toLowerCase() === team.officer.email.toLowerCase())).toHaveLength(1);
    expect(await mailsFor(revisionId)).toHaveLength(mails.length);
  });

  it("does not flag an edit of an apparatus that no active permit covers", async () => {
    const { team, cookie, apparatusId, permit } = await permitOverApparatus();
    const officerCookie = await signIn(team.officer.email);
    const revoked = await http(`/api/permits/${permit.id}/revoke`, {
      method: "POST",
      cookie: officerCookie,
      body: { expectedVersion: permit.version, reason: "Bench moved.", password: TEST_PASSWORD },
    });
    expect(revoked.status, revoked.text).toBe(200);
    const saved = await edit(cookie, apparatusId, 1, BIGGER_BANK);
    expect(saved.status, saved.text).toBe(200);
    expect(saved.json!.apparatus.permitsFlagged).toEqual([]);
    expect(await mailsFor(saved.json!.apparatus.revisionId)).toHaveLength(0);
  });

  it("amendment pre-fill: the holder starts a new application from the permit with the new apparatus revision", async () => {
    const { team, cookie, apparatusId, permit, application } = await permitOverApparatus();
    // Nothing to amend before the apparatus changes.
    const early = await http(`/api/permits/${permit.id}/amend`, { method: "POST", cookie, body: {} });
    expect(early.status, early.text).toBe(409);

    const saved = await edit(cookie, apparatusId, 1, BIGGER_BANK, "Larger bank fitted.");
    expect(saved.status, saved.text).toBe(200);
    const newRevisionId = saved.json!.apparatus.revisionId as string;

    // Only the holder amends: an officer learns nothing about the permit here.
    const officerTry = await http(`/api/permits/${permit.id}/amend`, {
      method: "POST",
      cookie: await signIn(team.officer.email),
      body: {},
    });
    expect(officerTry.status, officerTry.text).toBe(404);

    const started = await http(`/api/permits/${permit.id}/amend`, { method: "POST", cookie, body: {} });
    expect(started.status, started.text).toBe(201);
    const amendmentId = started.json!.application.id as string;
    expect(started.json!.editUrl).toBe(`/applications/${amendmentId}/edit`);
    expect(started.json!.application.tier).toBe(3);

    const [row] = await getDb().select().from(applications).where(eq(applications.id, amendmentId));
    expect(row.state).toBe("draft");
    expect(row.amendmentOfPermitId).toBe(permit.id);
    expect(row.apparatusId).toBe(apparatusId);
    expect(row.apparatusRevisionId).toBe(newRevisionId);

    const draftRes = await http(`/api/applications/${amendmentId}/draft`, { cookie });
    expect(draftRes.status, draftRes.text).toBe(200);
    const draft = draftRes.json!.application.draft;
    // The event as permitted, the apparatus as it is now.
    const [original] = await getDb().select().from(applications).where(eq(applications.id, application.id));
    expect(draft.event.title).toBe(original.title);
    expect(draft.event.firstDay).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(draft.apparatus.apparatusRevisionId).toBe(newRevisionId);
    expect(draft.apparatus.notes).toBe("Larger bank fitted.");
    expect(draft.apparatus.setup.sources[0].capacitance_F).toBe("1 µF");
    expect(draft.apparatus.setup.sources[0].voltage_V).toBe("10 kV");
    expect(draft.attestation.accepted).toBe(false);
    for (const c of draft.controls.required) expect(c.confirmed).toBe(false);

    // A second amendment beside the open one is refused.
    const twice = await http(`/api/permits/${permit.id}/amend`, { method: "POST", cookie, body: {} });
    expect(twice.status, twice.text).toBe(409);

    // Through the normal chain: confirm the tier-3 controls, attest, submit.
    const completed = {
      ...draft,
      // Tier 3 needs a named operator with current training (hazard-model.md's chain table).
      event: { ...draft.event, operators: [{ userId: null, name: "Opal Fenwick", trained: true }] },
      controls: {
        ...draft.controls,
        required: requiredControls(3).map((c) => ({ code: c.id, confirmed: true, note: "" })),
      },
      attestation: { accepted: true },
    };
    const put = await http(`/api/applications/${amendmentId}/draft`, {
      method: "PATCH",
      cookie,
      body: { expectedVersion: draftRes.json!.application.version, step: 6, draft: completed },
    });
    expect(put.status, put.text).toBe(200);
    const sent = await http(`/api/applications/${amendmentId}/submit`, {
      method: "POST",
      cookie,
      body: { expectedVersion: put.json!.application.version },
    });
    expect(sent.status, sent.text).toBe(200);
    expect(sent.json!.application.state).toBe("submitted");
    expect(sent.json!.application.tier).toBe(3);

    // The permit stays as approved, and its page links the amendment; the timeline says what it is.
    const [after] = await getDb().select().from(permits).where(eq(permits.id, permit.id));
    expect(after.state).toBe("active");
    const page = visibleText((await http(`/permits/${permit.id}`, { cookie })).text);
    expect(page).toMatch(/Amendment A-\d+ is submitted/);
    const appPage = visibleText((await http(`/applications/${amendmentId}`, { cookie })).text);
    expect(appPage).toContain(`Started as an amendment of permit ${permit.number}`);
  });
});
