// Shared by the re-review tests over HTTP and in the browser.
import { expect } from "vitest";
import { decide } from "@/lib/review/decide";
import { TEST_PASSWORD, uniq } from "../support/db";
import { http, signIn } from "../support/http";
import { asActor, createSubmittedApplication, createTeam, TIER_SETUPS } from "../review/support";

/** A tier-1 apparatus in the registry, and an active tier-1 permit over it held by the instructor. */
export async function permitOverApparatus() {
  const team = await createTeam();
  const cookie = await signIn(team.instructor.email);
  const name = `Jar bank ${uniq("ap")}`;
  const created = await http("/api/apparatus", {
    method: "POST",
    cookie,
    body: { name, room: "B12", notes: "", setup: TIER_SETUPS[1] },
  });
  expect(created.status, created.text).toBe(201);
  const apparatus = created.json!.apparatus as { id: string; revisionId: string };
  const { application } = await createSubmittedApplication({
    applicant: team.instructor,
    tier: 1,
    setup: TIER_SETUPS[1],
    apparatus: { id: apparatus.id, revisionId: apparatus.revisionId, name },
  });
  const { permit } = await decide(asActor(team.reviewer), application.id, {
    kind: "approve",
    expectedVersion: application.version,
    password: TEST_PASSWORD,
    confirmedRequirements: [],
    extraConditions: [],
  });
  return { team, cookie, name, apparatusId: apparatus.id, application, permit: permit! };
}
