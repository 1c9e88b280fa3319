import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { auditEvents, institutionSettings } from "@/db/schema";
import { permitPrefixSchema } from "@/lib/settings/schemas";
import { createUser, requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";

requireDatabase();

// The permit number prefix: product.md "a number (PREFIX-YYYY-NNNN, prefix from the institution
// settings, default HV)"; the format rule (1–6 upper-case letters or digits, a letter first) is the
// product's own, chosen so a prefix never reads as part of the year.

describe("the permit number prefix", () => {
  it("accepts short upper-case prefixes and refuses anything else, saying why", () => {
    for (const ok of ["HV", "P", "PHYS", "HV2", "ABCDEF"]) expect(permitPrefixSchema.parse(ok)).toBe(ok);
    const refused: [string, string][] = [
      ["", "Give a prefix."],
      ["hv", "Start with an upper-case letter (A–Z)."],
      ["2HV", "Start with an upper-case letter (A–Z)."],
      ["H-V", "Use only upper-case letters A–Z and digits 0–9."],
      ["HÉ", "Use only upper-case letters A–Z and digits 0–9."],
      ["ABCDEFG", "Use at most 6 characters."],
    ];
    for (const [value, message] of refused) {
      const result = permitPrefixSchema.safeParse(value);
      expect(result.success, value).toBe(false);
      expect(
        result.error?.issues.map((i) => i.message),
        value,
      ).toContain(message);
    }
  });

  describe("over HTTP (PATCH /api/admin/settings)", () => {
    let cookie = "";
    let before: (typeof institutionSettings.$inferSelect)[] = [];
    beforeAll(async () => {
      before = await getDb().select().from(institutionSettings);
      const admin = await createUser({ roles: ["admin"] });
      cookie = await signIn(admin.email);
    });
    afterAll(async () => {
      await getDb().delete(institutionSettings);
      if (before.length) await getDb().insert(institutionSettings).values(before);
    });

    it("answers 422 naming permitPrefix for a bad prefix and an unknown field, and changes nothing", async () => {
      const start = (await http("/api/admin/settings", { cookie })).json?.settings.permitPrefix;
      for (const body of [{ permitPrefix: "hv" }, { permitPrefix: "TOOLONG" }, { permitPrefix: 42 }, {}]) {
        const res = await http("/api/admin/settings", { method: "PATCH", cookie, body });
        expect(res.status, JSON.stringify(body)).toBe(422);
        expect(res.json?.error.issues.map((i: { path: string }) => i.path)).toContain("permitPrefix");
      }
      const extra = await http("/api/admin/settings", {
        method: "PATCH",
        cookie,
        body: { permitPrefix: "HV", name: "x" },
      });
      expect(extra.status).toBe(422);
      expect((await http("/api/admin/settings", { cookie })).json?.settings.permitPrefix).toBe(start);
    });

    it("stores a new prefix, shows it on the rules page and audits the change", async () => {
      const res = await http("/api/admin/settings", { method: "PATCH", cookie, body: { permitPrefix: "PHYS" } });
      expect(res.status).toBe(200);
      expect(res.json?.settings).toEqual({ permitPrefix: "PHYS" });
      const [row] = await getDb().select().from(institutionSettings).where(eq(institutionSettings.id, 1));
      expect(row.permitPrefix).toBe("PHYS");
      const page = await http("/admin/rules", { cookie });
      expect(page.text).toMatch(/PHYS-\d{4}-NNNN/);
      const audited = await getDb()
        .select({ data: auditEvents.data })
        .from(auditEvents)
        .where(eq(auditEvents.action, "settings.updated"));
      expect(audited.map((a) => (a.data as { permitPrefix: { to: string } }).permitPrefix.to)).toContain("PHYS");
    });

    it("is refused by the database too when written around the API", async () => {
      await expect(
        getDb().update(institutionSettings).set({ permitPrefix: "hv-1" }).where(eq(institutionSettings.id, 1)),
      ).rejects.toThrow();
    });
  });
});
