import { beforeAll, describe, expect, it } from "vitest";
import { assessSetup } from "@/lib/hazard";
import { createUser, requireDatabase } from "../support/db";
import { http, signIn } from "../support/http";

requireDatabase();

describe("POST /api/assess", () => {
  let cookie: string;
  beforeAll(async () => {
    cookie = await signIn((await createUser({ roles: ["instructor"] })).email);
  });

  it("answers the engine's assessment for a set-up", async () => {
    // 1 µF at 10 kV: E = ½CV² = 50 J, Q = CV = 10 mC (worked by hand).
    const setup = { sources: [{ id: "bank", kind: "capacitor", capacitance_F: 1e-6, voltage_V: 10_000 }] };
    const res = await http("/api/assess", { method: "POST", cookie, body: setup });
    expect(res.status).toBe(200);
    const a = res.json?.assessment;
    expect(a.energy_J).toBeCloseTo(50, 9);
    expect(a.charge_C).toBeCloseTo(0.01, 12);
    expect(a.tier).toBe(3);
    expect(a).toEqual(JSON.parse(JSON.stringify(assessSetup(setup as never))));
  });

  it("names the field of a zero capacitance, a series bank of one and a missing source list", async () => {
    const zero = await http("/api/assess", {
      method: "POST",
      cookie,
      body: { sources: [{ kind: "capacitor", capacitance_F: 0, voltage_V: 100 }] },
    });
    expect(zero.status).toBe(422);
    expect(zero.json?.error.issues[0].path).toBe("sources[0].capacitance_F");

    const series = await http("/api/assess", {
      method: "POST",
      cookie,
      body: { sources: [{ kind: "capacitor", capacitance_F: 1e-9, voltage_V: 100, count: 1, arrangement: "series" }] },
    });
    expect(series.status).toBe(422);
    expect(series.json?.error.issues[0].path).toBe("sources[0].count");

    const none = await http("/api/assess", { method: "POST", cookie, body: { sources: [] } });
    expect(none.status).toBe(422);
    expect(none.json?.error.issues[0].path).toBe("sources");
  });

  it("refuses malformed JSON with 400 and a non-JSON body with 415", async () => {
    const bad = await http("/api/assess", {
      method: "POST",
      cookie,
      rawBody: "{not json",
      headers: { "content-type": "application/json" },
    });
    expect(bad.status).toBe(400);
    const text = await http("/api/assess", {
      method: "POST",
      cookie,
      rawBody: "sources=1",
      headers: { "content-type": "text/plain" },
    });
    expect(text.status).toBe(415);
  });
});
