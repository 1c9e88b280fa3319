"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { FormProvider, useForm, useWatch } from "react-hook-form";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Card } from "@/app/_components/card";
import { cx } from "@/app/_components/cx";
import { ImplausibleConfirm, implausibleFlags, implausibleKey } from "@/app/_components/hazard/implausible-confirm";
import { QueryProvider } from "@/app/_components/hazard/query-provider";
import type { LiveAssessment } from "@/app/_components/hazard/use-live-assessment";
import { fieldNameOf } from "@/lib/apparatus/field-name";
import { FORM_STEPS, STEP_TITLES, type FormStep } from "@/lib/applications/form-steps";
import type { ApplicationDraft, AttachmentRef } from "@/lib/applications/schemas";
import { ApiError, apiFetch, type FieldIssue } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import type { Tier, TierRules } from "@/lib/hazard";
import type { ApparatusChoice } from "./apparatus-step";
import { EventStep } from "./event-step";
import { announceSubmitted } from "./form-subtitle";
import {
  ApparatusStep,
  AttachmentsStep,
  ControlsStep,
  preloadLaterSteps,
  ResultStep,
  ReturnComments,
  ReviewStep,
  SubmittedCard,
} from "./later-steps";
import type { ReturnComment } from "./return-comments";
import { StepLoading } from "./step-loading";
import { loadStepSchemas, stepResolver } from "./step-resolver";
import type { Submitted } from "./submitted-card";
import type { SubmissionTraining } from "./submission-training";
import { loadHazardEngine, useHazardEngine, type HazardEngine } from "./use-hazard-engine";
import { statusText, useAutosave } from "./use-autosave";
import { useFirstEdit } from "./use-first-edit";

export type FormInitial = {
  id: string | null;
  seq: number | null;
  state: "draft" | "returned";
  version: number;
  step: number;
  draft: ApplicationDraft;
  attachments: AttachmentRef[];
  savedAt: string | null;
  revisions: number;
  /** The reviewers' comments when the application was returned (with the applicant's replies). */
  returnComments?: ReturnComment[];
};

type ApplicationFormProps = { initial: FormInitial; rules: TierRules; choices: ApparatusChoice[] };

export function ApplicationForm(props: ApplicationFormProps) {
  return (
    <QueryProvider>
      <ApplicationFormInner {...props} />
    </QueryProvider>
  );
}

/** Shown while the engine downloads: nothing computed yet, and said so (never "incomplete"). */
const PENDING: LiveAssessment = { setup: null, assessment: null, issues: [], omittedGaps: [], pending: true };

function clampStep(step: number): FormStep {
  return (FORM_STEPS.includes(step as FormStep) ? step : 1) as FormStep;
}

/** The step in the address (`?step=3`), so browser Back and Forward move between steps. */
function stepFromQuery(value: string | null): FormStep | null {
  const step = Number(value);
  return value && FORM_STEPS.includes(step as FormStep) ? (step as FormStep) : null;
}

/** The edit page of a draft just created, at the step on screen. */
function editAddress(id: string): string {
  const step = new URLSearchParams(window.location.search).get("step");
  return `/applications/${id}/edit${step ? `?step=${step}` : ""}`;
}

function addressOf(step: FormStep): string {
  const url = new URL(window.location.href);
  url.searchParams.set("step", String(step));
  return `${url.pathname}${url.search}${url.hash}`;
}

function ApplicationFormInner({ initial, rules, choices }: ApplicationFormProps) {
  const router = useRouter();
  const searchParams = useSearchParams();
  // The address is the one place the step lives: Next.js keeps useSearchParams in step with
  // history.pushState and with Back/Forward, so moving on pushes an entry and Back pops it.
  const step = stepFromQuery(searchParams.get("step")) ?? clampStep(initial.step);
  const [attachments, setAttachments] = useState<AttachmentRef[]>(initial.attachments);
  const [appId, setAppId] = useState<string | null>(initial.id);
  const [submitted, setSubmitted] = useState<Submitted | null>(null);
  const [submitError, setSubmitError] = useState<{ message: string; issues: FieldIssue[] } | null>(null);
  const [submitting, setSubmitting] = useState(false);
  const [withdrawError, setWithdrawError] = useState<string | null>(null);
  const [checksWaiting, setChecksWaiting] = useState(false);
  const headingRef = useRef<HTMLHeadingElement>(null);

  // The resolver validates the step on screen (react-hook-form takes the newest options each render);
  // its schemas are fetched when first needed (step-resolver.ts).
  const form = useForm<ApplicationDraft>({
    defaultValues: initial.draft,
    resolver: stepResolver(step, rules, setChecksWaiting),
    // Checked on "Next", then on every change. Checking each field as it is left ("onTouched") put
    // a message above the next control between the press and the release of a click, so a click
    // meant for a checkbox landed beside it: moving the user's target is worse than a later message.
    mode: "onSubmit",
    reValidateMode: "onChange",
    shouldFocusError: true,
  });

  // Code the form needs only later is fetched later: the first edit starts the download of the
  // later steps, their schemas and the hazard engine (needed from step 2 on), so the next step is
  // usually there before it is asked for; opening the form at a later step fetches them at once.
  const edited = useFirstEdit(form);
  const later = edited || step !== 1;
  useEffect(() => {
    if (!later) return;
    preloadLaterSteps();
    loadStepSchemas().catch(() => {
      // Said when a step is checked (the resolver asks again).
    });
  }, [later]);

  const hazard = useHazardEngine(later);
  const engine = hazard.engine;
  const setupText = useWatch({ control: form.control, name: "apparatus.setup" });
  const setupKey = JSON.stringify(setupText ?? null);
  const live = useMemo(
    () => (engine ? engine.liveAssessmentOfJson(setupKey, rules) : PENDING),
    [engine, setupKey, rules],
  );
  const tier = (live.assessment?.tier ?? null) as Tier | null;

  // A figure that looks mistyped (engine "implausible" flag) is confirmed before the user moves on
  // from the apparatus step or submits; changing the figure asks again.
  const implausible = implausibleFlags(live.assessment);
  const implausibleNow = implausibleKey(implausible);
  const [confirmedImplausible, setConfirmedImplausible] = useState<string | null>(null);
  const [askedImplausible, setAskedImplausible] = useState(false);
  const implausibleConfirmed = implausible.length === 0 || confirmedImplausible === implausibleNow;
  const confirmRef = useRef<HTMLInputElement>(null);
  // The box is focused once it is on screen (after the engine arrives, when "Next" waited for it).
  const [askCount, setAskCount] = useState(0);
  const askToConfirm = () => {
    setAskedImplausible(true);
    setAskCount((n) => n + 1);
  };
  useEffect(() => {
    if (askCount === 0) return;
    confirmRef.current?.focus();
    confirmRef.current?.scrollIntoView({ block: "center" });
  }, [askCount]);
  /** Whether a figure that looks mistyped is still to be confirmed; waits for the engine if need be. */
  async function implausibleUnconfirmed(): Promise<boolean> {
    if (engine) return !implausibleConfirmed;
    let loaded: HazardEngine;
    try {
      loaded = await loadHazardEngine();
    } catch {
      // The hook says so on the step (with "Reload the page"); moving on waits for the check.
      return true;
    }
    const flags = implausibleFlags(
      loaded.liveAssessmentOfJson(JSON.stringify(form.getValues("apparatus.setup") ?? null), rules).assessment,
    );
    return flags.length > 0 && confirmedImplausible !== implausibleKey(flags);
  }
  const required = useMemo(
    () => (tier === null || !engine ? [] : engine.requiredControls(tier, rules)),
    [tier, rules, engine],
  );
  const onCreated = useCallback(
    (id: string) => {
      setAppId(id);
      // The draft exists now: its address is the edit page, so a reload resumes it (at the same step).
      window.history.replaceState(null, "", editAddress(id));
    },
    [setAppId],
  );
  const { status, saver } = useAutosave({
    form,
    initialId: initial.id,
    initialVersion: initial.version,
    initialSavedAt: initial.savedAt ? new Date(initial.savedAt) : null,
    step,
    onCreated,
  });

  // Every control the tier requires gets an entry in the draft (kept when the tier drops again).
  useEffect(() => {
    const entries = form.getValues("controls.required");
    const missing = required.filter((rule) => !entries.some((e) => e.code === rule.id));
    if (missing.length > 0) {
      form.setValue("controls.required", [
        ...entries,
        ...missing.map((rule) => ({ code: rule.id, confirmed: false, note: "" })),
      ]);
    }
  }, [required, form]);

  // A registry revision stays recorded only while the set-up is exactly as picked.
  const pickedRef = useRef<string | null>(
    initial.draft.apparatus.apparatusRevisionId ? JSON.stringify(initial.draft.apparatus.setup) : null,
  );
  const setupJson = JSON.stringify(setupText);
  useEffect(() => {
    if (
      pickedRef.current !== null &&
      pickedRef.current !== setupJson &&
      form.getValues("apparatus.apparatusRevisionId")
    ) {
      pickedRef.current = null;
      form.setValue("apparatus.apparatusRevisionId", null);
    }
  }, [setupJson, form]);

  // On every change of step (the buttons, or Back and Forward): a clean slate of messages, the
  // heading in focus, and the step saved with the draft so that reopening resumes there.
  const shownStep = useRef(step);
  useEffect(() => {
    if (shownStep.current === step) return;
    shownStep.current = step;
    form.clearErrors();
    saver.markDirty(false);
    headingRef.current?.focus();
    headingRef.current?.scrollIntoView({ block: "start" });
  }, [step, form, saver]);

  async function goTo(next: FormStep) {
    if (next === step) return;
    // A new draft gets its address (the edit page) from its first save; wait for it, so the steps'
    // history entries all belong to that address and Back never returns to an empty form.
    if (!saver.id && saver.edited) await saver.flush();
    window.history.pushState(null, "", addressOf(next));
  }

  const goNext = (event: React.FormEvent) =>
    form.handleSubmit(async () => {
      if (step === 2 && (await implausibleUnconfirmed())) return askToConfirm();
      return goTo(Math.min(6, step + 1) as FormStep);
    })(event);

  // On the last step, each named operator's training as the server checks it on the saved draft
  // (GET /api/applications/[id]/training): saved first, so the check sees what is on screen. Shown
  // once it answers (the last answer stays while a later visit to the step asks again).
  const [training, setTraining] = useState<SubmissionTraining | undefined>(undefined);
  useEffect(() => {
    if (step !== 6) return;
    let current = true;
    void (async () => {
      await saver.flush();
      if (!saver.id) return;
      try {
        const res = await apiFetch<{ training: SubmissionTraining }>(`/api/applications/${saver.id}/training`);
        if (current) setTraining(res.training);
      } catch {
        // Shown after submission on the application's page as well; a failed look-up here only hides it.
        if (current) setTraining(undefined);
      }
    })();
    return () => {
      current = false;
    };
  }, [step, saver]);

  const submit = (event: React.FormEvent) => form.handleSubmit(submitNow)(event);

  async function submitNow() {
    if (await implausibleUnconfirmed()) return askToConfirm();
    setSubmitError(null);
    setSubmitting(true);
    try {
      const saved = await saver.flush();
      const id = saver.id;
      if (!saved || !id) {
        setSubmitError({
          message: "The draft could not be saved, so it was not submitted. Nothing you typed is lost.",
          issues: [],
        });
        return;
      }
      const res = await apiFetch<{ application: Submitted & { version: number } }>(`/api/applications/${id}/submit`, {
        body: { expectedVersion: saver.version },
      });
      saver.setVersion(res.application.version);
      // No refresh here: the edit page would re-render for a submitted application and move away
      // from this confirmation (which carries the tier the server computed) before it is read.
      setSubmitted(res.application);
      announceSubmitted({ seq: initial.seq, revision: res.application.revision, state: res.application.state });
    } catch (error) {
      if (error instanceof ApiError) {
        applyApiIssues(error, form.setError, { nameOf: fieldNameOf });
        setSubmitError({ message: error.message, issues: error.issues });
      } else {
        setSubmitError({ message: "The application was not submitted. Try again.", issues: [] });
      }
    } finally {
      setSubmitting(false);
    }
  }

  async function withdraw() {
    const id = saver.id;
    if (!id) return;
    if (!window.confirm("Withdraw this application? It stays in your list as withdrawn and cannot be submitted."))
      return;
    setWithdrawError(null);
    try {
      await saver.flush();
      await apiFetch(`/api/applications/${id}/withdraw`, { body: { expectedVersion: saver.version } });
      router.push("/applications");
      router.refresh();
    } catch (error) {
      setWithdrawError(error instanceof Error ? error.message : "The application was not withdrawn.");
    }
  }

  if (submitted) {
    return <SubmittedCard submitted={submitted} applicationId={initial.id} returnComments={initial.returnComments} />;
  }

  return (
    <FormProvider {...form}>
      <div className="flex flex-col gap-4">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <p
            role="status"
            aria-live="polite"
            data-testid="save-status"
            data-state={status.kind}
            className={cx(
              "text-sm",
              status.kind === "saved"
                ? "text-stone-600"
                : status.kind === "saving"
                  ? "text-stone-700"
                  : "text-stone-800",
              (status.kind === "retrying" || status.kind === "conflict" || status.kind === "refused") &&
                "font-medium text-red-800",
            )}
          >
            {statusText(status)}
          </p>
          <div className="flex items-center gap-3">
            {initial.state === "returned" && (
              <span className="text-sm text-stone-700">
                Returned for changes: submitting makes revision {initial.revisions + 1}.
              </span>
            )}
            {/* Laid out before the first save creates the draft, so nothing under the pointer moves
                when it appears (a click meant for a field would land on the wrong one). */}
            <Button
              variant="ghost"
              size="sm"
              onClick={withdraw}
              disabled={!appId}
              aria-hidden={!appId || undefined}
              className={appId ? undefined : "invisible"}
            >
              Withdraw
            </Button>
          </div>
        </div>
        {withdrawError && <Alert tone="error">{withdrawError}</Alert>}
        {initial.returnComments && initial.id && (
          <ReturnComments applicationId={initial.id} comments={initial.returnComments} onGoTo={(s) => void goTo(s)} />
        )}
        {status.kind === "conflict" && (
          <Alert tone="error" title="This draft was saved elsewhere" live>
            <p>{status.message}</p>
            <div className="mt-2 flex flex-wrap gap-2">
              <Button size="sm" variant="secondary" onClick={() => void saver.loadSaved()}>
                Load the saved version
              </Button>
              <Button size="sm" onClick={() => void saver.keepMine()}>
                Save mine over it
              </Button>
            </div>
          </Alert>
        )}
        {status.kind === "refused" && (
          <Alert tone="error" title="Not saved" live>
            {status.message} What you typed is still here; correct it and the draft saves again.
          </Alert>
        )}
        {status.kind === "retrying" && (
          <Alert tone="warn" title="Not saved — retrying">
            {status.message} What you typed is kept here and saved as soon as the server answers.
          </Alert>
        )}

        <nav aria-label="Steps">
          <ol className="flex flex-wrap gap-1.5">
            {FORM_STEPS.map((s) => {
              const current = s === step;
              const label = (
                <>
                  <span className="figure">{s}</span> {STEP_TITLES[s]}
                </>
              );
              const classes = cx(
                "inline-flex items-center gap-1.5 rounded-md border px-2.5 py-1 text-sm",
                current
                  ? "border-ink-700 bg-ink-700 font-medium text-white"
                  : "border-stone-300 bg-white text-stone-700",
              );
              return (
                <li key={s}>
                  {s < step ? (
                    <button type="button" className={cx(classes, "hover:bg-stone-50")} onClick={() => void goTo(s)}>
                      {label}
                      <span className="sr-only"> (go back to this step)</span>
                    </button>
                  ) : (
                    <span className={classes} aria-current={current ? "step" : undefined}>
                      {label}
                    </span>
                  )}
                </li>
              );
            })}
          </ol>
        </nav>

        <form
          noValidate
          onSubmit={(e) => {
            e.preventDefault();
            if (step === 6) void submit(e);
            else void goNext(e);
          }}
        >
          <Card>
            <h2
              ref={headingRef}
              tabIndex={-1}
              className="mb-4 scroll-mt-4 text-lg font-semibold text-stone-900 focus:outline-none"
              data-testid="step-heading"
            >
              Step {step} of 6: {STEP_TITLES[step]}
            </h2>
            {step === 1 && <EventStep />}
            {step === 2 && (
              <ApparatusStep
                choices={choices}
                live={live}
                rules={rules}
                onPicked={(json) => {
                  pickedRef.current = json;
                  saver.markDirty(true);
                }}
              />
            )}
            {hazard.failed && step !== 1 && step !== 5 && (
              <Alert tone="error" title="The hazard calculation did not download" live className="mb-4">
                <p>Reload the page once the connection is back; the draft saves itself as you type.</p>
                <Button size="sm" variant="secondary" className="mt-2" onClick={() => window.location.reload()}>
                  Reload the page
                </Button>
              </Alert>
            )}
            {(step === 3 || step === 4 || step === 6) && live.pending ? (
              !hazard.failed && <StepLoading what="the hazard calculation" />
            ) : (
              <>
                {step === 3 && <ResultStep live={live} rules={rules} />}
                {step === 4 && <ControlsStep tier={tier} required={required} assessment={live.assessment} />}
                {step === 6 && (
                  <ReviewStep
                    live={live}
                    required={required}
                    attachments={attachments}
                    rules={rules}
                    training={training}
                    onGoTo={(s) => void goTo(s)}
                  />
                )}
              </>
            )}
            {step === 5 && <AttachmentsStep applicationId={appId} initial={attachments} onChange={setAttachments} />}
          </Card>

          {(step === 2 || (step === 6 && !implausibleConfirmed)) && implausible.length > 0 && (
            <div className="mt-4">
              <ImplausibleConfirm
                ref={confirmRef}
                flags={implausible}
                setup={live.setup}
                confirmed={implausibleConfirmed}
                onConfirmedChange={(checked) => setConfirmedImplausible(checked ? implausibleNow : null)}
                asked={askedImplausible}
                action={step === 2 ? "moving on" : "submitting"}
              />
            </div>
          )}

          <div aria-live="polite" className="mt-4">
            {checksWaiting && <p className="text-sm text-stone-700">Loading the checks for this step…</p>}
            {form.formState.errors.root?.message && (
              <Alert tone="error" title="Not checked">
                {form.formState.errors.root.message}
              </Alert>
            )}
            {submitError && (
              <Alert tone="error" title="Not submitted">
                <p>{submitError.message}</p>
                {submitError.issues.length > 1 && (
                  <ul className="mt-1 list-disc pl-5">
                    {submitError.issues.map((i) => (
                      <li key={`${i.path}-${i.message}`}>
                        <span className="figure">{i.path}</span>: {i.message}
                      </li>
                    ))}
                  </ul>
                )}
              </Alert>
            )}
          </div>

          <div className="mt-4 flex flex-wrap items-center justify-between gap-3">
            <div>
              {step > 1 && (
                <Button variant="secondary" onClick={() => void goTo((step - 1) as FormStep)}>
                  Back
                </Button>
              )}
            </div>
            <div className="flex items-center gap-3">
              <Link href="/applications" className="text-sm text-stone-700 underline">
                Leave and continue later
              </Link>
              {step < 6 ? (
                <Button type="submit">Next: {STEP_TITLES[(step + 1) as FormStep]}</Button>
              ) : (
                <Button type="submit" disabled={submitting}>
                  {submitting ? "Submitting…" : "Submit for review"}
                </Button>
              )}
            </div>
          </div>
        </form>
      </div>
    </FormProvider>
  );
}
