"use client";

import { useRouter } from "next/navigation";
import { useEffect, useId, useRef, useState } from "react";
import { Alert } from "@/app/_components/alert";
import { SignerCheck, type SigningProps } from "@/app/_components/auth/signer-check";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";
import { issuesByField } from "@/lib/client/form-errors";

// The signing panel on the application page, for whoever may act at the step the application waits
// at. The server decides again (role, department, separation of duties, state, version); this panel
// only offers what the server said this person may do. Nothing is chosen for the signer: a signature
// is a deliberate act, so the decision starts empty. A refused signature moves the view and the focus
// to its first problem, which may sit far above the button.

type Kind = "recommend" | "return" | "approve" | "reject";

export type DecisionPanelProps = {
  applicationId: string;
  version: number;
  allowed: Kind[];
  stepLabel: string;
  requirements: { id: string; text: string }[];
  validityDays: number;
  defaultValidFrom: string;
  defaultValidTo: string;
  /** The days the application asks for; a window beyond them needs a reason. */
  eventDays: { firstDay: string; lastDay: string } | null;
  pinOptions: { value: string; label: string }[];
  /** How this signer confirms a signature: password, or a fresh institutional sign-in. */
  signing: SigningProps;
  /** Lapsed or missing operator courses no exception covers: the approval waits for them (issue 17). */
  trainingHold?: number;
};

const KIND_TEXT: Record<Kind, { label: string; hint: string; button: string }> = {
  recommend: {
    label: "Recommend",
    hint: "Pass it to the safety officer for the final approval.",
    button: "Sign the recommendation",
  },
  return: {
    label: "Return for changes",
    hint: "Send it back to the applicant with your comment.",
    button: "Return to the applicant",
  },
  approve: { label: "Approve", hint: "Issue the permit. Needs your password.", button: "Sign and approve" },
  reject: {
    label: "Reject",
    hint: "Refuse it for good. Needs your password and a reason.",
    button: "Sign the rejection",
  },
};

const ERROR_KEYS = [
  "kind",
  "comment",
  "password",
  "confirmedRequirements",
  "validFrom",
  "validTo",
  "validityReason",
  "extraConditions",
  "pinnedTo",
] as const;
type Errors = Partial<Record<(typeof ERROR_KEYS)[number], string>>;

function dayText(isoDay: string): string {
  const [y, m, d] = isoDay.split("-").map(Number);
  return new Date(Date.UTC(y, m - 1, d)).toLocaleDateString("en-GB", {
    day: "numeric",
    month: "short",
    year: "numeric",
    timeZone: "UTC",
  });
}

export function DecisionPanel(props: DecisionPanelProps) {
  const router = useRouter();
  const id = useId();
  const formRef = useRef<HTMLFormElement>(null);
  const [kind, setKind] = useState<Kind | null>(null);
  const [comment, setComment] = useState("");
  const [pinnedTo, setPinnedTo] = useState("");
  const [password, setPassword] = useState("");
  const [confirmed, setConfirmed] = useState<string[]>([]);
  const [extra, setExtra] = useState("");
  const [validFrom, setValidFrom] = useState(props.defaultValidFrom);
  const [validTo, setValidTo] = useState(props.defaultValidTo);
  const [validityReason, setValidityReason] = useState("");
  const [errors, setErrors] = useState<Errors>({});
  const [status, setStatus] = useState<{ tone: "error"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  // Bumped on every refused attempt, so the same error twice still moves the focus.
  const [failedAttempt, setFailedAttempt] = useState(0);

  useEffect(() => {
    if (failedAttempt === 0) return;
    const form = formRef.current;
    if (!form) return;
    const target =
      form.querySelector<HTMLElement>('[aria-invalid="true"], [data-invalid]') ??
      form.querySelector<HTMLElement>("[data-status]");
    if (!target) return;
    target.scrollIntoView({ block: "center" });
    target.focus({ preventScroll: true });
  }, [failedAttempt]);

  const widened =
    kind === "approve" &&
    props.eventDays !== null &&
    (validFrom < props.eventDays.firstDay || validTo > props.eventDays.lastDay);

  const needsPassword = kind === "approve" || kind === "reject";
  const commentRequired = kind === "return" || kind === "reject";

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setStatus(null);
    const local: Errors = {};
    if (!kind) local.kind = "Choose a decision.";
    if (commentRequired && !comment.trim())
      local.comment = kind === "return" ? "Write what needs to change." : "Write the reason for the rejection.";
    if (needsPassword && props.signing.method === "password" && !password)
      local.password = "Enter your password to sign.";
    if (needsPassword && props.signing.method === "institution" && !props.signing.fresh)
      local.password = "Confirm it is you through your institution's sign-in first.";
    if (kind === "approve" && confirmed.length < props.requirements.length)
      local.confirmedRequirements = "Confirm every requirement of this tier.";
    if (widened && !validityReason.trim()) local.validityReason = "Give the reason for a window beyond the event days.";
    setErrors(local);
    if (Object.keys(local).length || !kind) {
      setFailedAttempt((n) => n + 1);
      return;
    }

    const base = { expectedVersion: props.version };
    const body =
      kind === "recommend"
        ? { ...base, kind, comment: comment.trim() || undefined }
        : kind === "return"
          ? { ...base, kind, comment, pinnedTo: pinnedTo || undefined }
          : kind === "reject"
            ? { ...base, kind, comment, password: password || undefined }
            : {
                ...base,
                kind,
                password: password || undefined,
                comment: comment.trim() || undefined,
                confirmedRequirements: confirmed,
                extraConditions: extra
                  .split("\n")
                  .map((l) => l.trim())
                  .filter(Boolean),
                validFrom,
                validTo,
                validityReason: widened ? validityReason.trim() : undefined,
              };
    setBusy(true);
    try {
      await apiFetch(`/api/review/${props.applicationId}/decisions`, { body });
      setPassword("");
      // The page re-renders with the new state and says what was recorded; this panel goes away
      // once nothing waits for this signer.
      router.replace(`/applications/${props.applicationId}?signed=${kind}`, { scroll: true });
      router.refresh();
    } catch (error) {
      setPassword("");
      if (error instanceof ApiError) {
        setErrors(issuesByField(error, ERROR_KEYS));
        setStatus({
          tone: "error",
          text: error.status === 409 ? `${error.message} Reload the page to see the current state.` : error.message,
        });
      } else {
        setStatus({ tone: "error", text: "The decision was not recorded." });
      }
      setFailedAttempt((n) => n + 1);
    } finally {
      setBusy(false);
    }
  }

  return (
    <form ref={formRef} onSubmit={submit} noValidate className="flex flex-col gap-4" aria-describedby={`${id}-step`}>
      <p id={`${id}-step`} className="text-sm text-stone-700">
        {props.stepLabel}
      </p>
      <div aria-live="polite" data-status={status ? "" : undefined} tabIndex={status ? -1 : undefined}>
        {status && <Alert tone={status.tone}>{status.text}</Alert>}
      </div>

      <fieldset>
        <legend className="text-sm font-medium text-stone-800">Your decision</legend>
        <div className="mt-1 flex flex-col gap-1.5">
          {props.allowed.map((k) => (
            <label key={k} className="flex items-start gap-2 text-sm text-stone-800">
              <input
                type="radio"
                name={`${id}-kind`}
                value={k}
                checked={kind === k}
                onChange={() => {
                  setKind(k);
                  setErrors({});
                }}
                className="mt-1 size-4"
                data-invalid={errors.kind ? "" : undefined}
                aria-describedby={errors.kind ? `${id}-kind-error` : undefined}
              />
              <span>
                <span className="font-medium">{KIND_TEXT[k].label}</span>
                <span className="block text-stone-600">{KIND_TEXT[k].hint}</span>
              </span>
            </label>
          ))}
        </div>
        {errors.kind && (
          <p id={`${id}-kind-error`} className="mt-1 text-sm text-red-800">
            {errors.kind}
          </p>
        )}
      </fieldset>

      {kind === "approve" && (props.trainingHold ?? 0) > 0 && (
        <Alert tone="warn" title="The approval waits for operator training">
          {props.trainingHold === 1 ? "One required course is" : `${props.trainingHold} required courses are`} lapsed or
          missing through the permit&apos;s last day (see “Named operators&apos; training”). Record the training, or
          record a training exception, then approve.
        </Alert>
      )}

      {kind === "approve" && props.requirements.length > 0 && (
        <fieldset>
          <legend className="text-sm font-medium text-stone-800">Conditions you confirm (printed on the permit)</legend>
          <div className="mt-1 flex flex-col gap-1.5">
            {props.requirements.map((r) => (
              <label key={r.id} className="flex items-start gap-2 text-sm text-stone-800">
                <input
                  type="checkbox"
                  value={r.id}
                  checked={confirmed.includes(r.id)}
                  onChange={(e) => setConfirmed((c) => (e.target.checked ? [...c, r.id] : c.filter((x) => x !== r.id)))}
                  className="mt-1 size-4"
                  aria-invalid={errors.confirmedRequirements ? true : undefined}
                />
                {r.text}
              </label>
            ))}
          </div>
          <p aria-live="polite" className="text-sm text-red-800">
            {errors.confirmedRequirements}
          </p>
        </fieldset>
      )}

      {kind === "approve" && (
        <>
          <div className="grid gap-3 sm:grid-cols-2">
            <Field
              label="Valid from"
              name="validFrom"
              type="date"
              value={validFrom}
              onChange={(e) => setValidFrom(e.target.value)}
              error={errors.validFrom}
            />
            <Field
              label="Valid to"
              name="validTo"
              type="date"
              value={validTo}
              onChange={(e) => setValidTo(e.target.value)}
              error={errors.validTo}
              hint={`At most ${props.validityDays} days for this tier; you may shorten it.`}
            />
          </div>
          {props.eventDays && (
            <p className="-mt-2 text-sm text-stone-600">
              The event runs {dayText(props.eventDays.firstDay)}
              {props.eventDays.lastDay !== props.eventDays.firstDay ? ` to ${dayText(props.eventDays.lastDay)}` : ""};
              the permit covers those days. A wider window needs a reason, printed on the permit.
            </p>
          )}
          {widened && (
            <FieldShell
              label="Reason for a window beyond the event days"
              required
              hint="Printed on the permit and signed with your approval."
              error={errors.validityReason}
            >
              {(a11y) => (
                <textarea
                  {...a11y}
                  rows={2}
                  value={validityReason}
                  onChange={(e) => setValidityReason(e.target.value)}
                  className={controlClasses}
                />
              )}
            </FieldShell>
          )}
          <FieldShell
            label="Further conditions"
            hint="Optional. One per line; printed on the permit."
            error={errors.extraConditions}
          >
            {(a11y) => (
              <textarea
                {...a11y}
                rows={2}
                value={extra}
                onChange={(e) => setExtra(e.target.value)}
                className={controlClasses}
              />
            )}
          </FieldShell>
        </>
      )}

      <FieldShell
        label={kind === "reject" ? "Reason" : "Comment"}
        required={commentRequired}
        hint={kind === "return" ? "Tell the applicant what to change." : commentRequired ? undefined : "Optional."}
        error={errors.comment}
      >
        {(a11y) => (
          <textarea
            {...a11y}
            rows={3}
            value={comment}
            onChange={(e) => setComment(e.target.value)}
            className={controlClasses}
          />
        )}
      </FieldShell>

      {kind === "return" && (
        <FieldShell
          label="Pin the comment to"
          hint="Optional: the step or field the applicant should look at."
          error={errors.pinnedTo}
        >
          {(a11y) => (
            <select {...a11y} value={pinnedTo} onChange={(e) => setPinnedTo(e.target.value)} className={controlClasses}>
              <option value="">The whole application</option>
              {props.pinOptions.map((o) => (
                <option key={o.value} value={o.value}>
                  {o.label}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
      )}

      {needsPassword && (
        <SignerCheck
          signing={props.signing}
          password={password}
          onPassword={setPassword}
          error={errors.password}
          hint="Signing needs your password again."
        />
      )}

      <Button
        type="submit"
        variant={kind === "reject" ? "danger" : "primary"}
        disabled={busy}
        aria-busy={busy || undefined}
      >
        {busy ? "Signing…" : kind ? KIND_TEXT[kind].button : "Sign"}
      </Button>
    </form>
  );
}
