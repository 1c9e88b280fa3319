"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";
import { MAX_EMERGENCY_CONTACTS } from "@/lib/settings/schemas";

// The institution's emergency contacts, one row each (who answers, the number). Sent whole to
// PUT /api/admin/emergency-contacts, which validates with the same schema; each refusal is shown
// beside its field (paths like contacts[1].phone).

type Contact = { label: string; phone: string };
type Issue = { path: string; message: string };

export function EmergencyContactsForm({ contacts }: { contacts: Contact[] }) {
  const router = useRouter();
  const [rows, setRows] = useState<Contact[]>(contacts.length ? contacts : [{ label: "", phone: "" }]);
  const [issues, setIssues] = useState<Issue[]>([]);
  const [status, setStatus] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  const issueAt = (path: string) => issues.find((i) => i.path === path)?.message;
  const edit = (index: number, patch: Partial<Contact>) =>
    setRows((current) => current.map((row, i) => (i === index ? { ...row, ...patch } : row)));

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    try {
      await apiFetch("/api/admin/emergency-contacts", { method: "PUT", body: { contacts: rows } });
      setIssues([]);
      setStatus({ tone: "success", text: "Saved. Permits, bench cards and the live sheet print these from now on." });
      router.refresh();
    } catch (e) {
      setIssues(e instanceof ApiError ? e.issues : []);
      setStatus({ tone: "error", text: e instanceof ApiError ? e.message : "Nothing was changed." });
    }
    setBusy(false);
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <div aria-live="polite">{status && <Alert tone={status.tone}>{status.text}</Alert>}</div>
      {issueAt("contacts") && <p className="text-sm text-red-800">{issueAt("contacts")}</p>}
      {rows.map((row, index) => (
        <fieldset key={index} className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_12rem_auto] sm:items-end">
          <legend className="sr-only">Contact {index + 1}</legend>
          <Field
            label={index === 0 ? "Who answers (first: the live sheet's number)" : "Who answers"}
            name={`contact-${index}-label`}
            value={row.label}
            onChange={(e) => edit(index, { label: e.target.value })}
            maxLength={60}
            error={issueAt(`contacts[${index}].label`)}
          />
          <Field
            label="Phone"
            name={`contact-${index}-phone`}
            type="tel"
            value={row.phone}
            onChange={(e) => edit(index, { phone: e.target.value })}
            maxLength={30}
            error={issueAt(`contacts[${index}].phone`)}
            figure
          />
          <Button
            type="button"
            variant="secondary"
            disabled={rows.length <= 1}
            onClick={() => setRows((current) => current.filter((_, i) => i !== index))}
          >
            Remove<span className="sr-only"> contact {index + 1}</span>
          </Button>
        </fieldset>
      ))}
      <div className="flex flex-wrap gap-2">
        <Button
          type="button"
          variant="secondary"
          disabled={rows.length >= MAX_EMERGENCY_CONTACTS}
          onClick={() => setRows((current) => [...current, { label: "", phone: "" }])}
        >
          Add a contact
        </Button>
        <Button type="submit" disabled={busy}>
          {busy ? "Saving…" : "Save the contacts"}
        </Button>
      </div>
    </form>
  );
}
