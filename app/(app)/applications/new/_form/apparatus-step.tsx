"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { useFormContext, useFormState, useWatch } from "react-hook-form";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { controlClasses, Field, FieldShell } from "@/app/_components/field";
import { LiveFigures } from "@/app/_components/hazard/live-figures";
import { SetupEditor } from "@/app/_components/hazard/setup-editor";
import type { LiveAssessment } from "@/app/_components/hazard/use-live-assessment";
import { setupToText } from "@/lib/apparatus/setup-text";
import { apiFetch } from "@/lib/client/api";
import { TIER_LABELS, type SetupInput, type Tier, type TierRules } from "@/lib/hazard";
import type { ApplicationDraft } from "@/lib/applications/schemas";
import { messageAt } from "./errors";

export type ApparatusChoice = { id: string; name: string; room: string; tier: number; currentRevision: number };

type ApparatusDetail = {
  apparatus: {
    id: string;
    currentRevision: number;
    current: { id: string; revision: number; name: string; room: string; notes: string; setup: SetupInput };
  };
};

type ApparatusStepProps = {
  choices: readonly ApparatusChoice[];
  live: LiveAssessment;
  rules: TierRules;
  /** Remembers the set-up text as picked, so an edit of it can be noticed. */
  onPicked: (setupJson: string) => void;
};

export function ApparatusStep({ choices, live, rules, onPicked }: ApparatusStepProps) {
  const { control, register, setValue, getValues } = useFormContext<ApplicationDraft>();
  const { errors } = useFormState({ control });
  const queryClient = useQueryClient();
  const [pickError, setPickError] = useState<string | null>(null);
  const [picking, setPicking] = useState(false);
  const ids = useWatch({ control, name: ["apparatus.apparatusId", "apparatus.apparatusRevisionId"] });
  const picked = choices.find((c) => c.id === ids[0]);
  // The picker shows the record in use (from "Use in an application" or an earlier pick), so its
  // label and the sentence under it agree; choosing another record is a change of the picker only.
  const [chosen, setChoice] = useState<string | null>(null);
  const choice = chosen ?? picked?.id ?? "";

  async function pick() {
    if (!choice) return;
    setPicking(true);
    setPickError(null);
    try {
      const detail = await queryClient.fetchQuery({
        queryKey: ["apparatus", choice],
        queryFn: () => apiFetch<ApparatusDetail>(`/api/apparatus/${choice}`),
      });
      const current = detail.apparatus.current;
      const text = setupToText(current.setup);
      setValue("apparatus.name", current.name, { shouldDirty: true });
      setValue("apparatus.room", current.room, { shouldDirty: true });
      setValue("apparatus.notes", current.notes, { shouldDirty: true });
      setValue("apparatus.setup", text, { shouldDirty: true });
      setValue("apparatus.apparatusId", detail.apparatus.id, { shouldDirty: true });
      setValue("apparatus.apparatusRevisionId", current.id, { shouldDirty: true });
      if (!getValues("event.room")) setValue("event.room", current.room, { shouldDirty: true });
      onPicked(JSON.stringify(text));
    } catch (error) {
      setPickError(error instanceof Error ? error.message : "The record could not be loaded.");
    } finally {
      setPicking(false);
    }
  }

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_18rem]">
      <div className="flex min-w-0 flex-col gap-6">
        {choices.length > 0 && (
          <section aria-labelledby="registry-heading" className="rounded-lg border border-stone-200 bg-white p-3">
            <h3 id="registry-heading" className="text-sm font-semibold text-stone-900">
              From the registry
            </h3>
            <div className="mt-2 flex flex-wrap items-end gap-2">
              <FieldShell label="Registered apparatus" className="min-w-56 flex-1">
                {(a11y) => (
                  <select
                    {...a11y}
                    value={choice}
                    onChange={(e) => setChoice(e.target.value)}
                    className={controlClasses}
                  >
                    <option value="">Choose a record…</option>
                    {choices.map((c) => (
                      <option key={c.id} value={c.id}>
                        {c.name} · {c.room} · tier {c.tier} ({TIER_LABELS[c.tier as Tier]})
                      </option>
                    ))}
                  </select>
                )}
              </FieldShell>
              <Button
                variant="secondary"
                onClick={pick}
                disabled={!choice || picking || (choice === ids[0] && Boolean(ids[1]))}
              >
                {picking ? "Loading…" : "Use this record"}
              </Button>
            </div>
            <div aria-live="polite" className="mt-2 text-sm">
              {pickError && <Alert tone="error">{pickError}</Alert>}
              {ids[0] && ids[1] && (
                <p className="text-stone-700">
                  Using {picked ? `“${picked.name}”` : "a registry record"} as registered
                  {picked ? ` (revision ${picked.currentRevision})` : ""}. Changing the set-up below makes it this
                  application&apos;s own.
                </p>
              )}
              {ids[0] && !ids[1] && (
                <p className="text-stone-700">
                  Based on {picked ? `“${picked.name}”` : "a registry record"}, changed for this application.
                </p>
              )}
            </div>
          </section>
        )}
        <div className="grid gap-4 sm:grid-cols-2">
          <Field
            label="Apparatus name"
            required
            maxLength={160}
            autoComplete="off"
            error={messageAt(errors, "apparatus.name")}
            {...register("apparatus.name")}
          />
          <Field
            label="Where it is kept"
            maxLength={120}
            autoComplete="off"
            error={messageAt(errors, "apparatus.room")}
            {...register("apparatus.room")}
          />
          <FieldShell label="Notes" error={messageAt(errors, "apparatus.notes")} className="sm:col-span-2">
            {(a11y) => (
              <textarea
                {...a11y}
                rows={2}
                maxLength={4000}
                className={controlClasses}
                {...register("apparatus.notes")}
              />
            )}
          </FieldShell>
        </div>
        <SetupEditor prefix="apparatus.setup" />
      </div>
      <div className="lg:sticky lg:top-4 lg:self-start">
        <LiveFigures live={live} prefix="apparatus.setup" rules={rules} />
      </div>
    </div>
  );
}
