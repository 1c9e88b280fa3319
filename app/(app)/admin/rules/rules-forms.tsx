"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";
import type { ChainRules, Requirement, StepRole } from "@/lib/rules/chain";

// The admin's chain and reminder rule forms, and the permit number prefix (the tier thresholds are
// tier-rules-form.tsx). Each rule form adopts a new version
// through POST /api/admin/rules; the prefix goes to PATCH /api/admin/settings. The server validates
// again and names the field of any problem.

type Status = { tone: "success" | "error"; text: string; issues?: { path: string; message: string }[] } | null;

async function adopt(body: unknown): Promise<Status> {
  try {
    const { ruleSet } = await apiFetch<{ ruleSet: { version: number } }>("/api/admin/rules", { body });
    return { tone: "success", text: `Version ${ruleSet.version} adopted.` };
  } catch (e) {
    if (e instanceof ApiError) return { tone: "error", text: e.message, issues: e.issues };
    return { tone: "error", text: "Nothing was adopted." };
  }
}

function StatusBox({ status }: { status: Status }) {
  return (
    <div aria-live="polite">
      {status && (
        <Alert tone={status.tone} live>
          {status.text}
          {status.issues && status.issues.length > 1 && (
            <ul className="mt-1 list-disc pl-5">
              {status.issues.map((i) => (
                <li key={i.path + i.message}>
                  <span className="figure">{i.path}</span>: {i.message}
                </li>
              ))}
            </ul>
          )}
        </Alert>
      )}
    </div>
  );
}

const CHAINS: { value: string; label: string; steps: StepRole[] }[] = [
  { value: "none", label: "None: recorded, self-certified", steps: [] },
  { value: "reviewer", label: "One reviewer", steps: ["reviewer"] },
  { value: "officer", label: "Safety officer", steps: ["safety_officer"] },
  { value: "reviewer-officer", label: "Reviewer, then safety officer", steps: ["reviewer", "safety_officer"] },
];

function chainValue(steps: StepRole[]): string {
  return CHAINS.find((c) => c.steps.join() === steps.join())?.value ?? "reviewer-officer";
}

function slug(text: string): string {
  return (
    text
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 60) || "requirement"
  );
}

/** Requirements as lines of text; a line that matches an earlier requirement keeps its id. */
function toRequirements(text: string, earlier: Requirement[]): Requirement[] {
  const used = new Set<string>();
  return text
    .split("\n")
    .map((l) => l.trim())
    .filter(Boolean)
    .map((line) => {
      let id = earlier.find((r) => r.text === line)?.id ?? slug(line);
      for (let n = 2; used.has(id); n++) id = `${slug(line).slice(0, 56)}-${n}`;
      used.add(id);
      return { id, text: line };
    });
}

export function ChainRulesForm({ rules }: { rules: ChainRules }) {
  const router = useRouter();
  const [rows, setRows] = useState(
    rules.tiers.map((t) => ({
      chain: chainValue(t.steps),
      validityDays: String(t.validityDays),
      requirements: t.requirements.map((r) => r.text).join("\n"),
    })),
  );
  // Audience controls (issue 20, item 9): what the event's audience adds to any tier's requirements.
  const [audience, setAudience] = useState(
    (rules.audience ?? []).map((r) => ({
      id: r.id,
      text: r.text,
      public: r.public,
      minSize: r.minSize === null ? "" : String(r.minSize),
      minTier: String(r.minTier),
    })),
  );
  const [note, setNote] = useState("");
  const [status, setStatus] = useState<Status>(null);
  const [busy, setBusy] = useState(false);
  const updateAudience = (index: number, patch: Partial<(typeof audience)[number]>) =>
    setAudience((a) => a.map((row, i) => (i === index ? { ...row, ...patch } : row)));
  const audienceIssue = (index: number, field: string) =>
    status?.issues?.find((i) => i.path.startsWith(`rules.audience[${index}].${field}`))?.message;
  const audienceListIssue = status?.issues?.find((i) => i.path === "rules.audience")?.message;

  const update = (tier: number, patch: Partial<(typeof rows)[number]>) =>
    setRows((r) => r.map((row, i) => (i === tier ? { ...row, ...patch } : row)));
  const issueFor = (tier: number, field: string) =>
    status?.issues?.find((i) => i.path.startsWith(`rules.tiers[${tier}].${field}`))?.message;

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    const body = {
      kind: "chain",
      note,
      rules: {
        tiers: rows.map((row, tier) => ({
          steps: CHAINS.find((c) => c.value === row.chain)?.steps ?? [],
          validityDays: Number(row.validityDays),
          requirements: toRequirements(row.requirements, rules.tiers[tier].requirements),
        })),
        audience: audience
          .filter((row) => row.text.trim() !== "")
          .map((row) => {
            const [{ id }] = toRequirements(row.text, row.id ? [{ id: row.id, text: row.text.trim() }] : []);
            return {
              id,
              text: row.text.trim(),
              public: row.public,
              minSize: row.minSize.trim() === "" ? null : Number(row.minSize),
              minTier: Number(row.minTier),
            };
          }),
      },
    };
    const result = await adopt(body);
    setStatus(result);
    setBusy(false);
    if (result?.tone === "success") router.refresh();
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <StatusBox status={status} />
      {rows.map((row, tier) => (
        <fieldset key={tier} className="rounded-md border border-stone-200 px-3 py-3">
          <legend className="px-1 text-sm font-semibold text-stone-900">Tier {tier}</legend>
          <div className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_9rem]">
            <FieldShell label="Review chain" error={issueFor(tier, "steps")}>
              {(a11y) => (
                <select
                  {...a11y}
                  value={row.chain}
                  onChange={(e) => update(tier, { chain: e.target.value })}
                  className={controlClasses}
                >
                  {CHAINS.map((c) => (
                    <option key={c.value} value={c.value}>
                      {c.label}
                    </option>
                  ))}
                </select>
              )}
            </FieldShell>
            <Field
              label="Longest validity (days)"
              name={`validity-${tier}`}
              inputMode="numeric"
              value={row.validityDays}
              onChange={(e) => update(tier, { validityDays: e.target.value })}
              error={issueFor(tier, "validityDays")}
              figure
            />
          </div>
          <FieldShell
            label="Extra requirements (one per line)"
            hint="The final approver confirms each one; they are printed on the permit as conditions."
            error={issueFor(tier, "requirements")}
            className="mt-3"
          >
            {(a11y) => (
              <textarea
                {...a11y}
                rows={Math.max(2, row.requirements.split("\n").length)}
                value={row.requirements}
                onChange={(e) => update(tier, { requirements: e.target.value })}
                className={controlClasses}
              />
            )}
          </FieldShell>
        </fieldset>
      ))}
      <fieldset className="rounded-md border border-stone-200 px-3 py-3" data-testid="audience-controls">
        <legend className="px-1 text-sm font-semibold text-stone-900">Audience controls</legend>
        <p className="text-xs text-stone-600">
          Added to the tier&apos;s requirements when the event&apos;s audience includes members of the public, or
          numbers at least the given people. The final approver confirms each one; they are printed on the permit as
          conditions. A tier without signers (tier 0 by default) prints them at once.
        </p>
        {audienceListIssue && <p className="mt-1 text-sm text-red-800">{audienceListIssue}</p>}
        <ol className="mt-3 flex flex-col gap-3">
          {audience.map((row, index) => (
            <li key={index} className="rounded border border-stone-200 bg-stone-50/60 p-3">
              <FieldShell label={`Audience control ${index + 1}`} error={audienceIssue(index, "text")}>
                {(a11y) => (
                  <textarea
                    {...a11y}
                    rows={2}
                    value={row.text}
                    onChange={(e) => updateAudience(index, { text: e.target.value })}
                    className={controlClasses}
                  />
                )}
              </FieldShell>
              <div className="mt-2 grid gap-3 sm:grid-cols-3">
                <label className="flex items-center gap-2 self-end text-sm text-stone-800">
                  <input
                    type="checkbox"
                    className="size-4"
                    checked={row.public}
                    onChange={(e) => updateAudience(index, { public: e.target.checked })}
                  />
                  When members of the public attend
                </label>
                <Field
                  label="Or from this many people"
                  hint="Empty: the size alone never applies it."
                  name={`audience-size-${index}`}
                  inputMode="numeric"
                  value={row.minSize}
                  onChange={(e) => updateAudience(index, { minSize: e.target.value })}
                  error={audienceIssue(index, "minSize")}
                  figure
                />
                <FieldShell label="From tier" error={audienceIssue(index, "minTier")}>
                  {(a11y) => (
                    <select
                      {...a11y}
                      value={row.minTier}
                      onChange={(e) => updateAudience(index, { minTier: e.target.value })}
                      className={controlClasses}
                    >
                      {[0, 1, 2, 3, 4].map((t) => (
                        <option key={t} value={String(t)}>
                          Tier {t} and above
                        </option>
                      ))}
                    </select>
                  )}
                </FieldShell>
              </div>
              <div className="mt-2 flex justify-end">
                <Button variant="ghost" size="sm" onClick={() => setAudience((a) => a.filter((_, i) => i !== index))}>
                  Remove audience control {index + 1}
                </Button>
              </div>
            </li>
          ))}
        </ol>
        <Button
          variant="secondary"
          size="sm"
          className="mt-3"
          onClick={() => setAudience((a) => [...a, { id: "", text: "", public: true, minSize: "", minTier: "1" }])}
        >
          Add audience control
        </Button>
      </fieldset>
      <Field
        label="Note for the record"
        name="chain-note"
        value={note}
        onChange={(e) => setNote(e.target.value)}
        hint="Why the rules change."
      />
      <Button type="submit" disabled={busy} className="self-start">
        {busy ? "Adopting…" : "Adopt as a new version"}
      </Button>
    </form>
  );
}

export function ReminderForm({ daysBefore }: { daysBefore: number[] }) {
  const router = useRouter();
  const [days, setDays] = useState(daysBefore.join(", "));
  const [note, setNote] = useState("");
  const [status, setStatus] = useState<Status>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    const parsed = days
      .split(/[,\s]+/)
      .filter(Boolean)
      .map((d) => Number(d));
    if (parsed.some((d) => !Number.isInteger(d))) {
      setStatus({ tone: "error", text: "Enter whole numbers of days, separated by commas." });
      return;
    }
    setBusy(true);
    const result = await adopt({ kind: "reminders", note, rules: { daysBefore: parsed } });
    setStatus(result);
    setBusy(false);
    if (result?.tone === "success") router.refresh();
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <StatusBox status={status} />
      <Field
        label="Days before expiry"
        name="reminder-days"
        value={days}
        onChange={(e) => setDays(e.target.value)}
        // One meaning in label and hint (the label said "0 = the day after" while the hint said "on the
        // day the permit expires"): lib/jobs/reminders.ts sends N on the last valid day + 1 − N.
        hint="Comma-separated, e.g. 30, 7, 1, 0. 1 is sent on the permit's last valid day; 0 the day after it, saying the permit has expired."
        error={status?.issues?.find((i) => i.path.startsWith("rules.daysBefore"))?.message}
        figure
      />
      <Field label="Note for the record" name="reminder-note" value={note} onChange={(e) => setNote(e.target.value)} />
      <Button type="submit" disabled={busy} className="self-start">
        {busy ? "Adopting…" : "Adopt the schedule"}
      </Button>
    </form>
  );
}

export function PermitPrefixForm({ prefix, year }: { prefix: string; year: number }) {
  const router = useRouter();
  const [value, setValue] = useState(prefix);
  const [status, setStatus] = useState<Status>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    try {
      const { settings } = await apiFetch<{ settings: { permitPrefix: string } }>("/api/admin/settings", {
        method: "PATCH",
        body: { permitPrefix: value },
      });
      setStatus({ tone: "success", text: `New permits are numbered ${settings.permitPrefix}-${year}-NNNN.` });
      router.refresh();
    } catch (e) {
      setStatus(
        e instanceof ApiError
          ? { tone: "error", text: e.message, issues: e.issues }
          : { tone: "error", text: "Nothing was changed." },
      );
    }
    setBusy(false);
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <StatusBox status={status} />
      <Field
        label="Prefix"
        name="permit-prefix"
        value={value}
        // Upper case as typed: the server accepts only A–Z and 0–9.
        onChange={(e) => setValue(e.target.value.toUpperCase())}
        maxLength={6}
        autoComplete="off"
        spellCheck={false}
        hint={`1 to 6 upper-case letters or digits, starting with a letter. Example: ${value || "HV"}-${year}-0001.`}
        error={status?.issues?.find((i) => i.path.startsWith("permitPrefix"))?.message}
        figure
        className="max-w-40"
      />
      <Button type="submit" disabled={busy} className="self-start">
        {busy ? "Saving…" : "Save the prefix"}
      </Button>
    </form>
  );
}
