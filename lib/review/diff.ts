// The field-level difference between two revisions of an application: what a reviewer needs to see
// after returning it — event details, energy sources and gaps, controls, attachments and the figures
// that follow from them. Pure: both revisions' stored content and assessment in, rows out.

import type { Assessment } from "@/lib/hazard";
import { audienceLabel, eventKindLabel, fieldLabel, figureRows, formatFieldValue, formatPerson } from "./present";

export type DiffSection =
  "Event" | "Apparatus" | "Energy sources" | "Spark gaps" | "Bleeders" | "Controls" | "Attachments" | "Figures";

export type DiffEntry = {
  section: DiffSection;
  /** Field path in the content ("event.firstDay", "apparatus.setup.sources[1].voltage_V") or the figure. */
  path: string;
  label: string;
  before: string;
  after: string;
};

export type RevisionView = { content: Record<string, unknown>; assessment: Assessment };

type Row = { section: DiffSection; path: string; label: string; value: string };

const rec = (v: unknown): Record<string, unknown> =>
  v && typeof v === "object" && !Array.isArray(v) ? (v as Record<string, unknown>) : {};
const list = (v: unknown): unknown[] => (Array.isArray(v) ? v : []);

function eventRows(content: Record<string, unknown>): Row[] {
  const e = rec(content.event);
  const row = (field: string, label: string, value: string): Row => ({
    section: "Event",
    path: `event.${field}`,
    label,
    value,
  });
  return [
    row("title", "Title", formatFieldValue("title", e.title)),
    row("kind", "Kind of event", e.kind ? eventKindLabel(e.kind) : "—"),
    row("room", "Room or place", formatFieldValue("room", e.room)),
    row("audience", "Audience", e.audience ? audienceLabel(e.audience) : "—"),
    row("audienceSize", "Audience size", formatFieldValue("audienceSize", e.audienceSize)),
    row("firstDay", "First day", formatFieldValue("firstDay", e.firstDay)),
    row("lastDay", "Last day", formatFieldValue("lastDay", e.lastDay)),
    row("responsible", "Responsible person", formatPerson(rec(e.responsible))),
    row(
      "operators",
      "Operators",
      list(e.operators)
        .map((p) => formatPerson(rec(p)))
        .join(", ") || "—",
    ),
  ];
}

function setupRows(content: Record<string, unknown>): Row[] {
  const a = rec(content.apparatus);
  const setup = rec(a.setup);
  const rows: Row[] = [
    { section: "Apparatus", path: "apparatus.name", label: "Apparatus", value: formatFieldValue("name", a.name) },
    { section: "Apparatus", path: "apparatus.room", label: "Apparatus room", value: formatFieldValue("room", a.room) },
    {
      section: "Apparatus",
      path: "apparatus.notes",
      label: "Apparatus notes",
      value: formatFieldValue("notes", a.notes),
    },
    {
      section: "Apparatus",
      path: "apparatus.setup.bodyResistance_ohm",
      label: "Body model resistance",
      value:
        setup.bodyResistance_ohm === undefined
          ? "default"
          : formatFieldValue("bodyResistance_ohm", setup.bodyResistance_ohm),
    },
    {
      section: "Apparatus",
      path: "apparatus.setup.vacuumDevice",
      label: "Vacuum device driven",
      value: formatFieldValue("vacuumDevice", setup.vacuumDevice ?? false),
    },
  ];
  list(setup.sources).forEach((raw, i) => {
    const source = rec(raw);
    const name = `Source ${i + 1}${typeof source.id === "string" && source.id ? ` (${source.id})` : ""}`;
    for (const [field, value] of Object.entries(source)) {
      if (field === "id") continue;
      rows.push({
        section: "Energy sources",
        path: `apparatus.setup.sources[${i}].${field}`,
        label: `${name}: ${fieldLabel(field)}`,
        value: formatFieldValue(field, value),
      });
    }
  });
  list(setup.gaps).forEach((raw, i) => {
    for (const [field, value] of Object.entries(rec(raw))) {
      rows.push({
        section: "Spark gaps",
        path: `apparatus.setup.gaps[${i}].${field}`,
        label: `Gap ${i + 1}: ${fieldLabel(field)}`,
        value: formatFieldValue(field, value),
      });
    }
  });
  // Bleeders wired across sources (engine v2), beside a source's own bleeder_ohm.
  list(setup.bleeders).forEach((raw, i) => {
    const bleeder = rec(raw);
    const name = `Bleeder ${i + 1}${typeof bleeder.id === "string" && bleeder.id ? ` (${bleeder.id})` : ""}`;
    for (const [field, value] of Object.entries(bleeder)) {
      if (field === "id") continue;
      rows.push({
        section: "Bleeders",
        path: `apparatus.setup.bleeders[${i}].${field}`,
        label: `${name}: ${fieldLabel(field)}`,
        value: formatFieldValue(field, value),
      });
    }
  });
  return rows;
}

function controlRows(content: Record<string, unknown>): Row[] {
  const c = rec(content.controls);
  const rows: Row[] = list(c.required).map((raw) => {
    const control = rec(raw);
    const code = String(control.code ?? "?");
    const confirmed = control.confirmed ? "confirmed" : "not confirmed";
    const note = typeof control.note === "string" && control.note ? ` — ${control.note}` : "";
    return {
      section: "Controls" as const,
      path: `controls.required.${code}`,
      label: typeof control.text === "string" && control.text ? control.text : code,
      value: confirmed + note,
    };
  });
  rows.push({
    section: "Controls",
    path: "controls.additional",
    label: "Additional controls",
    value: formatFieldValue("additional", c.additional),
  });
  return rows;
}

function attachmentRows(content: Record<string, unknown>): Row[] {
  const names = list(content.attachments)
    .map((a) => String(rec(a).filename ?? ""))
    .filter(Boolean)
    .sort();
  return [{ section: "Attachments", path: "attachments", label: "Attachments", value: names.join(", ") || "none" }];
}

function figureDiffRows(assessment: Assessment): Row[] {
  return figureRows(assessment).map((f) => ({
    section: "Figures" as const,
    path: `figures.${f.key}`,
    label: f.label,
    value: f.value,
  }));
}

function rowsOf(view: RevisionView): Row[] {
  return [
    ...eventRows(view.content),
    ...setupRows(view.content),
    ...controlRows(view.content),
    ...attachmentRows(view.content),
    ...figureDiffRows(view.assessment),
  ];
}

/** Every field whose shown value differs, in the order of the form (added and removed fields too). */
export function revisionDiff(before: RevisionView, after: RevisionView): DiffEntry[] {
  const old = new Map(rowsOf(before).map((r) => [r.path, r]));
  const next = rowsOf(after);
  const out: DiffEntry[] = [];
  const seen = new Set<string>();
  for (const row of next) {
    seen.add(row.path);
    const prior = old.get(row.path);
    const was = prior?.value ?? "—";
    if (was !== row.value)
      out.push({ section: row.section, path: row.path, label: row.label, before: was, after: row.value });
  }
  for (const [path, row] of old) {
    if (!seen.has(path) && row.value !== "—") {
      out.push({ section: row.section, path, label: row.label, before: row.value, after: "—" });
    }
  }
  const order: DiffSection[] = [
    "Event",
    "Apparatus",
    "Energy sources",
    "Spark gaps",
    "Bleeders",
    "Controls",
    "Attachments",
    "Figures",
  ];
  return out.sort((a, b) => order.indexOf(a.section) - order.indexOf(b.section));
}
