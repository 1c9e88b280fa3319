"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { QuantityInput } from "@/app/_components/hazard/quantity-input";
import { TierBadge } from "@/app/_components/tier-badge";
import type { Tier } from "@/app/_components/tier";
import { editableQuantity, readQuantity } from "@/lib/apparatus/setup-text";
import { ApiError, apiFetch } from "@/lib/client/api";
import {
  BASE_UNIT,
  formatQuantity,
  readableSource,
  referenceAnchor,
  type Threshold,
  type TierRules,
} from "@/lib/hazard";
import type { RulesPreview, TierMove } from "@/lib/rules/preview-types";
import {
  checkTierRules,
  defaultThreshold,
  THRESHOLD_ROWS,
  THRESHOLD_SECTIONS,
  thresholdAt,
  withThreshold,
  type ThresholdRow,
} from "@/lib/rules/thresholds";

// The tier thresholds as a form: one row per threshold with its meaning, the value typed in SI
// notation (the application form's QuantityInput and parser), the default and the source, linked to
// its entry on the References page. A changed value asks for its own source. The engine's check
// (validateRules, the same the server runs) keeps the tiers in order as the admin types. Adopting waits
// for a preview of the records whose tier the new set would change; the JSON of the whole set stays
// available for bulk edits.

type RowState = { text: string; source: string };

function suggestVersion(current: string): string {
  const match = /^(.*?)(\d+)$/.exec(current);
  return match ? `${match[1]}${Number(match[2]) + 1}` : `${current}-2`;
}

function initialRows(rules: TierRules): Record<string, RowState> {
  const out: Record<string, RowState> = {};
  for (const row of THRESHOLD_ROWS) {
    const t = thresholdAt(rules, row.path) ?? defaultThreshold(row);
    out[row.key] = { text: editableQuantity(t.value, row.dimension), source: "" };
  }
  return out;
}

/** The threshold a row stands for: the value typed, with the source of the set it matches or the one typed. */
function rowThreshold(row: ThresholdRow, state: RowState, inForce: Threshold, value: number): Threshold {
  const unit = BASE_UNIT[row.dimension];
  if (value === inForce.value) return inForce;
  const builtIn = defaultThreshold(row);
  if (value === builtIn.value) return builtIn;
  return { value, unit, source: state.source.trim() };
}

type Built = { rules: TierRules | null; fieldErrors: Record<string, string>; orderIssue: string | null };

/**
 * The rule set the form describes: `base` (the set in force, or one loaded as JSON) for what the form
 * has no rows for (the controls), each row's threshold, and the name typed.
 */
function build(inForceRules: TierRules, base: TierRules, rows: Record<string, RowState>, version: string): Built {
  let rules: TierRules = { ...structuredClone(base), rulesVersion: version.trim() };
  const fieldErrors: Record<string, string> = {};
  for (const row of THRESHOLD_ROWS) {
    const read = readQuantity(rows[row.key].text, row.dimension);
    if (read.empty) {
      fieldErrors[row.key] = "Enter a value.";
      continue;
    }
    if (!read.ok) {
      fieldErrors[row.key] = read.message;
      continue;
    }
    const inForce = thresholdAt(inForceRules, row.path) ?? defaultThreshold(row);
    const t = rowThreshold(row, rows[row.key], inForce, read.value);
    if (t.source === "") fieldErrors[`${row.key}.source`] = "Say where the new value comes from.";
    rules = withThreshold(rules, row.path, t);
  }
  if (Object.keys(fieldErrors).length > 0) return { rules: null, fieldErrors, orderIssue: null };
  const issue = checkTierRules(rules);
  if (issue) {
    const key = issue.path.filter((p) => p !== "value" && p !== "unit" && p !== "source").join(".");
    if (THRESHOLD_ROWS.some((r) => r.key === key)) fieldErrors[key] = issue.message;
    return { rules: null, fieldErrors, orderIssue: `rules.${issue.path.join(".")}: ${issue.message}` };
  }
  return { rules, fieldErrors, orderIssue: null };
}

function SourceText({ threshold }: { threshold: Threshold }) {
  const text = readableSource(threshold.source);
  if (!threshold.ref) return <span>{text}</span>;
  return (
    <Link href={`/references#${referenceAnchor(threshold.ref)}`} className="underline underline-offset-2">
      {text}
    </Link>
  );
}

function MoveTable({ caption, moves, kind }: { caption: string; moves: TierMove[]; kind: "application" | "permit" }) {
  if (moves.length === 0) return <p className="text-sm text-stone-700">{caption}: none would change.</p>;
  return (
    <table className="w-full text-left text-sm">
      <caption className="mb-1 text-left font-semibold text-stone-900">
        {caption}: {moves.length} would change
      </caption>
      <thead>
        <tr className="border-b border-stone-200 text-stone-600">
          <th scope="col" className="py-1 pr-3 font-medium">
            {kind === "application" ? "Application" : "Permit"}
          </th>
          <th scope="col" className="py-1 pr-3 font-medium">
            Department
          </th>
          <th scope="col" className="py-1 pr-3 font-medium">
            Tier now
          </th>
          <th scope="col" className="py-1 font-medium">
            Under the new thresholds
          </th>
        </tr>
      </thead>
      <tbody>
        {moves.map((m) => (
          <tr key={m.id} className="border-b border-stone-100" data-testid={`move-${m.id}`}>
            <td className="py-1.5 pr-3">
              <Link
                href={kind === "application" ? `/applications/${m.id}` : `/permits/${m.id}`}
                className="figure underline underline-offset-2"
              >
                {m.reference}
              </Link>
              {m.title && <span className="block text-stone-700">{m.title}</span>}
            </td>
            <td className="py-1.5 pr-3 text-stone-700">{m.departmentName}</td>
            <td className="py-1.5 pr-3">
              <TierBadge tier={m.tierNow as Tier} size="sm" />
              {m.recordedTier !== m.tierNow && (
                <span className="block text-xs text-stone-600">recorded as tier {m.recordedTier}</span>
              )}
            </td>
            <td className="py-1.5">
              <span className="sr-only">becomes </span>
              <TierBadge tier={m.tierNew as Tier} size="sm" />
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function TierRulesForm({ rules }: { rules: TierRules }) {
  const router = useRouter();
  const [rows, setRows] = useState(() => initialRows(rules));
  const [base, setBase] = useState(rules);
  const [generation, setGeneration] = useState(0);
  const [version, setVersion] = useState(() => suggestVersion(rules.rulesVersion));
  const [note, setNote] = useState("");
  const [json, setJson] = useState("");
  const [status, setStatus] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const [serverIssues, setServerIssues] = useState<{ path: string; message: string }[]>([]);
  const [preview, setPreview] = useState<{ key: string; result: RulesPreview } | null>(null);
  const [busy, setBusy] = useState<"preview" | "adopt" | null>(null);

  const built = useMemo(() => build(rules, base, rows, version), [rules, base, rows, version]);
  const builtKey = built.rules ? JSON.stringify(built.rules) : null;
  const previewed = preview !== null && preview.key === builtKey;

  const update = (key: string, patch: Partial<RowState>) => {
    setRows((r) => ({ ...r, [key]: { ...r[key], ...patch } }));
    setServerIssues([]);
  };
  const serverIssue = (key: string) =>
    serverIssues.find((i) => i.path === `rules.${key}` || i.path.startsWith(`rules.${key}.`))?.message;

  async function runPreview() {
    if (!built.rules || !builtKey) return;
    setBusy("preview");
    setStatus(null);
    try {
      const { preview: result } = await apiFetch<{ preview: RulesPreview }>("/api/admin/rules/preview", {
        body: { rules: built.rules },
      });
      setPreview({ key: builtKey, result });
    } catch (e) {
      setPreview(null);
      if (e instanceof ApiError) {
        setServerIssues(e.issues);
        setStatus({ tone: "error", text: e.message });
      } else setStatus({ tone: "error", text: "The preview could not be made." });
    }
    setBusy(null);
  }

  async function adopt(event: React.FormEvent) {
    event.preventDefault();
    if (!built.rules || !previewed) return;
    setBusy("adopt");
    try {
      const { ruleSet } = await apiFetch<{ ruleSet: { version: number } }>("/api/admin/rules", {
        body: { kind: "tier", note, rules: built.rules },
      });
      setStatus({ tone: "success", text: `Version ${ruleSet.version} (${built.rules.rulesVersion}) adopted.` });
      setPreview(null);
      router.refresh();
    } catch (e) {
      if (e instanceof ApiError) {
        setServerIssues(e.issues);
        setStatus({ tone: "error", text: e.message });
      } else setStatus({ tone: "error", text: "Nothing was adopted." });
    }
    setBusy(null);
  }

  function loadJson() {
    let parsed: unknown;
    try {
      parsed = JSON.parse(json);
    } catch {
      setStatus({ tone: "error", text: "That is not valid JSON." });
      return;
    }
    const issue = checkTierRules(parsed);
    if (issue) {
      setStatus({ tone: "error", text: `rules.${issue.path.join(".")}: ${issue.message}` });
      return;
    }
    const loaded = parsed as TierRules;
    const next: Record<string, RowState> = {};
    for (const row of THRESHOLD_ROWS) {
      const t = thresholdAt(loaded, row.path) ?? defaultThreshold(row);
      const inForce = thresholdAt(rules, row.path) ?? defaultThreshold(row);
      const same = t.value === inForce.value || t.value === defaultThreshold(row).value;
      next[row.key] = { text: editableQuantity(t.value, row.dimension), source: same ? "" : t.source };
    }
    setRows(next);
    setBase(loaded);
    setGeneration((g) => g + 1);
    setVersion(loaded.rulesVersion === rules.rulesVersion ? suggestVersion(rules.rulesVersion) : loaded.rulesVersion);
    setStatus({ tone: "success", text: "Loaded into the form. Preview the change before adopting it." });
  }

  function downloadJson() {
    const data = JSON.stringify(built.rules ?? rules, null, 2);
    const url = URL.createObjectURL(new Blob([data], { type: "application/json" }));
    const a = document.createElement("a");
    a.href = url;
    a.download = `tier-thresholds-${(built.rules ?? rules).rulesVersion}.json`;
    a.click();
    URL.revokeObjectURL(url);
  }

  const versionError =
    serverIssues.find((i) => i.path === "rules.rulesVersion")?.message ??
    (version.trim() === "" ? "Name the new set." : undefined);

  return (
    <form onSubmit={adopt} noValidate className="flex flex-col gap-5" data-testid="tier-rules-form">
      <div aria-live="polite">
        {status && (
          <Alert tone={status.tone} live>
            {status.text}
          </Alert>
        )}
      </div>
      <Field
        label="Name of the new set"
        name="tier-rules-version"
        value={version}
        onChange={(e) => {
          setVersion(e.target.value);
          setServerIssues([]);
        }}
        hint={`Every assessment records the name of the thresholds it used; the set in force is ${rules.rulesVersion}.`}
        error={versionError}
        figure
        className="max-w-80"
      />
      {built.orderIssue && (
        <Alert tone="error">
          <span data-testid="tier-order-issue">{built.orderIssue}</span>
        </Alert>
      )}
      {THRESHOLD_SECTIONS.map((section) => (
        <fieldset key={section.title} className="rounded-md border border-stone-200 px-3 py-3">
          <legend className="px-1 text-sm font-semibold text-stone-900">{section.title}</legend>
          <ul className="flex flex-col divide-y divide-stone-100">
            {section.rows.map((row) => {
              const state = rows[row.key];
              const inForce = thresholdAt(rules, row.path) ?? defaultThreshold(row);
              const builtIn = defaultThreshold(row);
              const read = readQuantity(state.text, row.dimension);
              const value = !read.empty && read.ok ? read.value : null;
              const custom = value !== null && value !== inForce.value && value !== builtIn.value;
              const shown = value === null ? inForce : rowThreshold(row, state, inForce, value);
              const unit = BASE_UNIT[row.dimension];
              return (
                <li
                  key={row.key}
                  className="grid gap-x-4 gap-y-1 py-2.5 sm:grid-cols-[minmax(0,1fr)_14rem]"
                  data-threshold={row.key}
                >
                  <QuantityInput
                    // Uncontrolled, as on the application form; a JSON load mounts the rows afresh.
                    key={`${row.key}-${generation}`}
                    label={row.meaning}
                    name={`threshold.${row.key}`}
                    dimension={row.dimension}
                    text={state.text}
                    example={editableQuantity(builtIn.value, row.dimension)}
                    defaultValue={state.text}
                    onChange={(e) => update(row.key, { text: e.target.value })}
                    error={built.fieldErrors[row.key] ?? serverIssue(row.key)}
                    hint={
                      <span className="figure">
                        rules.{row.key} · in {unit}
                      </span>
                    }
                  />
                  <dl className="grid grid-cols-[4.5rem_1fr] content-start gap-x-2 gap-y-0.5 text-xs text-stone-700 sm:pt-6">
                    <dt className="text-stone-500">Default</dt>
                    <dd className="figure text-stone-900">{formatQuantity(builtIn.value, builtIn.unit)}</dd>
                    <dt className="text-stone-500">Source</dt>
                    <dd>{custom ? <span>the source given below</span> : <SourceText threshold={shown} />}</dd>
                  </dl>
                  {custom && (
                    <Field
                      label="Source of the new value"
                      name={`threshold.${row.key}.source`}
                      value={state.source}
                      onChange={(e) => update(row.key, { source: e.target.value })}
                      hint="Publication, edition and clause, or the institution's rule that sets it."
                      error={built.fieldErrors[`${row.key}.source`]}
                      fieldClassName="sm:col-span-2"
                    />
                  )}
                </li>
              );
            })}
          </ul>
        </fieldset>
      ))}

      <div className="flex flex-col gap-3 rounded-md border border-stone-200 px-3 py-3">
        <h3 className="text-sm font-semibold text-stone-900">Before adopting: what would change</h3>
        <p className="text-xs text-stone-600">
          Every open application and active permit is assessed again on its stored set-up, under the thresholds in force
          and under these. Nothing stored changes: approved permits keep their tier; the list is for deciding whether to
          re-review them. Drafts are assessed again when they are submitted.
        </p>
        <Button
          variant="secondary"
          className="self-start"
          disabled={!built.rules || busy !== null}
          onClick={runPreview}
          data-testid="preview-rules"
        >
          {busy === "preview" ? "Assessing…" : "Preview the change"}
        </Button>
        {preview && (
          <div className="flex flex-col gap-3" data-testid="rules-preview" aria-live="polite">
            {!previewed && (
              <Alert tone="info">The form changed since this preview; preview again before adopting.</Alert>
            )}
            <p className="text-sm text-stone-700">
              Checked {preview.result.checked.applications} open applications and {preview.result.checked.permits}{" "}
              active permits ({preview.result.rulesVersionNow} → {preview.result.rulesVersionNew}).
              {preview.result.checked.unreadable > 0 &&
                ` ${preview.result.checked.unreadable} stored set-ups could not be assessed and are not listed.`}
            </p>
            <MoveTable caption="Open applications" moves={preview.result.applications} kind="application" />
            <MoveTable caption="Active permits" moves={preview.result.permits} kind="permit" />
          </div>
        )}
      </div>

      <Field
        label="Note for the record"
        name="tier-note"
        value={note}
        onChange={(e) => setNote(e.target.value)}
        hint="Why the thresholds change."
      />
      <Button
        type="submit"
        disabled={!previewed || busy !== null}
        className="self-start"
        data-testid="adopt-tier-rules"
      >
        {busy === "adopt" ? "Adopting…" : "Adopt these thresholds"}
      </Button>
      {!previewed && <p className="-mt-3 text-xs text-stone-600">Preview the change first.</p>}

      <details className="rounded-md border border-stone-200 px-3 py-2">
        <summary className="cursor-pointer text-sm font-medium text-stone-900">Bulk edit as JSON</summary>
        <div className="mt-3 flex flex-col gap-3">
          <p className="text-xs text-stone-600">
            The whole set in SI base units, controls included. Paste a set here and load it into the form; it is checked
            as the server checks it, then previewed and adopted from the form.
          </p>
          <div className="flex flex-wrap gap-2">
            <Button
              variant="secondary"
              size="sm"
              onClick={() => setJson(JSON.stringify(built.rules ?? rules, null, 2))}
            >
              Show the form as JSON
            </Button>
            <Button variant="secondary" size="sm" onClick={downloadJson}>
              Download JSON
            </Button>
          </div>
          <FieldShell label="Thresholds (JSON, SI base units)">
            {(a11y) => (
              <textarea
                {...a11y}
                rows={12}
                spellCheck={false}
                value={json}
                onChange={(e) => setJson(e.target.value)}
                className={`${controlClasses} figure text-xs`}
              />
            )}
          </FieldShell>
          <Button variant="secondary" size="sm" className="self-start" onClick={loadJson} disabled={json.trim() === ""}>
            Load into the form
          </Button>
        </div>
      </details>
    </form>
  );
}
