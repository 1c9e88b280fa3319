"use client";

import { useQuery } from "@tanstack/react-query";
import { useEffect, useId, useState } from "react";
import { get, useFormContext, useFormState, useWatch } from "react-hook-form";
import { Button } from "@/app/_components/button";
import { controlClasses, FieldShell } from "@/app/_components/field";
import { apiFetch } from "@/lib/client/api";
import type { ApplicationDraft } from "@/lib/applications/schemas";

// A person named on the application: a name, optionally linked to an Benchclear account (found by
// name) so that the review chain knows they may not decide on it. Typing over a linked name unlinks it.

type Person = { id: string; name: string; departmentName: string | null };

type PersonFieldProps = {
  /** "event.responsible" or "event.operators.N". */
  name: "event.responsible" | `event.operators.${number}`;
  label: string;
  required?: boolean;
};

export function PersonField({ name, label, required }: PersonFieldProps) {
  const { control, register, setValue } = useFormContext<ApplicationDraft>();
  const { errors } = useFormState({ control });
  const person = useWatch({ control, name }) as ApplicationDraft["event"]["responsible"] | undefined;
  const [query, setQuery] = useState("");
  const listId = useId();
  const typed = person?.name ?? "";
  const linked = Boolean(person?.userId);

  // Search a moment after typing stops, only for unlinked names of two letters or more.
  useEffect(() => {
    const text = linked ? "" : typed.trim();
    const timer = setTimeout(() => setQuery(text.length >= 2 ? text : ""), 300);
    return () => clearTimeout(timer);
  }, [typed, linked]);

  const people = useQuery({
    queryKey: ["people", query],
    queryFn: ({ signal }) =>
      apiFetch<{ people: Person[] }>(`/api/applications/people?q=${encodeURIComponent(query)}`, { signal }),
    enabled: query.length >= 2,
  });
  const matches = (people.data?.people ?? []).slice(0, 5);
  const nameField = register(`${name}.name`, {
    onChange: () => {
      if (person?.userId) setValue(`${name}.userId`, null, { shouldDirty: true });
    },
  });
  const error = (get(errors, `${name}.name`) ?? get(errors, `${name}.userId`)) as { message?: string } | undefined;

  return (
    <div className="flex flex-col gap-1">
      <FieldShell
        label={label}
        required={required}
        hint={linked ? "Linked to an Benchclear account." : "A name, or find the person's Benchclear account."}
        error={error?.message}
      >
        {(a11y) => <input {...a11y} {...nameField} maxLength={120} autoComplete="off" className={controlClasses} />}
      </FieldShell>
      {linked ? (
        <div>
          <Button variant="ghost" size="sm" onClick={() => setValue(`${name}.userId`, null, { shouldDirty: true })}>
            Unlink the account of {typed || "this person"}
          </Button>
        </div>
      ) : (
        matches.length > 0 && (
          <div>
            <p id={listId} className="text-xs text-stone-600">
              Benchclear accounts matching “{query}”:
            </p>
            <ul aria-labelledby={listId} className="mt-1 flex flex-wrap gap-1.5">
              {matches.map((p) => (
                <li key={p.id}>
                  <Button
                    variant="secondary"
                    size="sm"
                    onClick={() => {
                      setValue(`${name}.name`, p.name, { shouldDirty: true });
                      setValue(`${name}.userId`, p.id, { shouldDirty: true });
                    }}
                  >
                    Link {p.name}
                    {p.departmentName ? ` (${p.departmentName})` : ""}
                  </Button>
                </li>
              ))}
            </ul>
          </div>
        )
      )}
    </div>
  );
}
