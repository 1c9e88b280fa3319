"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useRef, useState } from "react";
import { FormProvider, useForm, useWatch } from "react-hook-form";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { useBrowserDraft } from "@/app/_components/forms/use-browser-draft";
import { useLeaveGuard } from "@/app/_components/forms/use-leave-guard";
import { controlClasses, Field, FieldShell } from "@/app/_components/field";
import { ImplausibleConfirm, implausibleFlags, implausibleKey } from "@/app/_components/hazard/implausible-confirm";
import { LiveFigures } from "@/app/_components/hazard/live-figures";
import { QueryProvider } from "@/app/_components/hazard/query-provider";
import { SetupEditor } from "@/app/_components/hazard/setup-editor";
import { useLiveAssessment } from "@/app/_components/hazard/use-live-assessment";
import { apparatusFormSchema, fieldNameOf, type ApparatusFormValues } from "@/lib/apparatus/form";
import { apiFetch } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import type { TierRules } from "@/lib/hazard";

type ApparatusFormProps = {
  rules: TierRules;
  initial: ApparatusFormValues;
  /** Names the draft kept in this browser: the user and the record (or "new"). */
  draftKey: string;
} & ({ mode: "create" } | { mode: "edit"; apparatusId: string; revision: number });

export function ApparatusForm(props: ApparatusFormProps) {
  return (
    <QueryProvider>
      <ApparatusFormInner {...props} />
    </QueryProvider>
  );
}

type Saved = { apparatus: { id: string; revision: number } };

const draftTime = new Intl.DateTimeFormat("en-GB", {
  day: "numeric",
  month: "short",
  hour: "2-digit",
  minute: "2-digit",
});

function ApparatusFormInner(props: ApparatusFormProps) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | null>(null);
  const form = useForm<ApparatusFormValues>({
    resolver: zodResolver(apparatusFormSchema, undefined, { raw: true }),
    defaultValues: props.initial,
    // A field is checked as soon as it is left (then on every change), not only on submit.
    mode: "onTouched",
  });
  const setupText = useWatch({ control: form.control, name: "setup" });
  const live = useLiveAssessment(setupText, props.rules);
  const errors = form.formState.errors;
  // A figure that looks mistyped (engine "implausible" flag) is confirmed before saving.
  const implausible = implausibleFlags(live.assessment);
  const implausibleNow = implausibleKey(implausible);
  const [confirmedImplausible, setConfirmedImplausible] = useState<string | null>(null);
  const [askedImplausible, setAskedImplausible] = useState(false);
  const implausibleConfirmed = implausible.length === 0 || confirmedImplausible === implausibleNow;
  const confirmRef = useRef<HTMLInputElement>(null);
  // Unsaved typing is kept in this browser and leaving with it asks first (issue: a reload or a
  // click on Dashboard wiped the form).
  const draft = useBrowserDraft(form, props.draftKey);
  const [saved, setSaved] = useState(false);
  useLeaveGuard(form.formState.isDirty && !saved);

  const save = useMutation({
    mutationFn: async (values: ApparatusFormValues) => {
      const body = apparatusFormSchema.parse(values);
      if (props.mode === "create") return apiFetch<Saved>("/api/apparatus", { body });
      return apiFetch<Saved>(`/api/apparatus/${props.apparatusId}`, {
        method: "PATCH",
        body: { ...body, expectedRevision: props.revision },
      });
    },
    onSuccess: (saved) => {
      draft.clear();
      setSaved(true);
      router.push(`/apparatus/${saved.apparatus.id}`);
      router.refresh();
    },
    onError: (error) => {
      applyApiIssues(error, form.setError, { nameOf: fieldNameOf });
      setFailure(error.message);
    },
  });

  // Built at the event, not during render: the callback reads the confirmation checkbox ref.
  const onSubmit = (event: React.FormEvent<HTMLFormElement>) =>
    form.handleSubmit(
      (values) => {
        setFailure(null);
        if (!implausibleConfirmed) {
          setAskedImplausible(true);
          confirmRef.current?.focus();
          return;
        }
        save.mutate(values);
      },
      () => setFailure("Some fields need attention; each is marked below."),
    )(event);

  return (
    <FormProvider {...form}>
      <form onSubmit={onSubmit} noValidate className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="flex min-w-0 flex-col gap-6">
          <div aria-live="polite">{failure && <Alert tone="error">{failure}</Alert>}</div>
          {draft.restoredAt && (
            <Alert tone="info" title="Your unsaved typing is back">
              <p>
                What you typed on this device ({draftTime.format(draft.restoredAt)}) was not saved; it is filled in
                below. Save it, or{" "}
                <button type="button" className="font-medium underline" onClick={draft.discard}>
                  discard it
                </button>
                .
              </p>
            </Alert>
          )}
          <Card title="Details">
            <div className="grid gap-4 sm:grid-cols-2">
              <Field
                label="Name"
                required
                maxLength={160}
                autoComplete="off"
                error={errors.name?.message}
                {...form.register("name")}
              />
              <Field
                label="Room"
                required
                maxLength={120}
                autoComplete="off"
                error={errors.room?.message}
                {...form.register("room")}
              />
              <FieldShell
                label="Notes"
                hint="Construction, where it is stored, who maintains it."
                error={errors.notes?.message}
                className="sm:col-span-2"
              >
                {(a11y) => (
                  <textarea
                    {...a11y}
                    rows={3}
                    maxLength={4000}
                    className={controlClasses}
                    {...form.register("notes")}
                  />
                )}
              </FieldShell>
            </div>
          </Card>
          <Card title="Set-up" description="Type values as on a bench sheet: 4.7 nF, 30 kV, 5 mm, 2 MΩ.">
            <SetupEditor prefix="setup" />
          </Card>
          <ImplausibleConfirm
            ref={confirmRef}
            flags={implausible}
            setup={live.setup}
            confirmed={implausibleConfirmed}
            onConfirmedChange={(checked) => setConfirmedImplausible(checked ? implausibleNow : null)}
            asked={askedImplausible}
            action="saving"
          />
          <div className="flex flex-wrap gap-3">
            <Button type="submit" disabled={save.isPending}>
              {save.isPending
                ? "Saving…"
                : props.mode === "create"
                  ? "Register apparatus"
                  : `Save as revision ${props.revision + 1}`}
            </Button>
          </div>
        </div>
        <div className="lg:sticky lg:top-4 lg:self-start">
          <LiveFigures live={live} prefix="setup" rules={props.rules} />
        </div>
      </form>
    </FormProvider>
  );
}
