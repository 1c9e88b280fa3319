"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useCallback, useEffect, useRef, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import Link from "next/link";
import { Alert } from "@/app/_components/alert";
import { buttonClasses } from "@/app/_components/button-classes";
import { cx } from "@/app/_components/cx";
import { useBrowserDraft } from "@/app/_components/forms/use-browser-draft";
import { ApiError, apiFetch } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import type { ChecklistItem } from "@/lib/checks/checklist";
import { ANSWER_LABELS, CHECK_NOTE_MAX, PRE_USE_ANSWERS, recordCheckSchema } from "@/lib/checks/schemas";

// The checklist on a phone at the bench. Made for a weak signal: the answers and the check's
// idempotency key live in this browser (use-browser-draft) from the first tap, so a reload, a lost
// page or a failed submit loses nothing; a submit that did not get an answer is sent again — when the
// phone is back online, every few seconds, or at a tap — always with the same key, so the server
// records the check once however many copies arrive. Targets are at least 44 px high (WCAG 2.5.5).

type Answer = (typeof PRE_USE_ANSWERS)[number];
type FormValues = {
  idempotencyKey: string;
  items: { id: string; answer: Answer | ""; note: string; photoId: string | null }[];
  note: string;
};
type Recorded = { check: { id: string; checkedAt: string; anyNo: boolean; replayed: boolean } };
type SendState =
  | { kind: "idle" }
  | { kind: "sending" }
  | { kind: "waiting"; message: string; delayMs: number }
  | { kind: "done"; check: Recorded["check"] };

// Back-off between automatic retries, in milliseconds: a few seconds, then up to one minute.
const RETRY_DELAYS_MS = [3_000, 6_000, 12_000, 30_000, 60_000];

const ANSWER_LOOK: Record<Answer, string> = {
  yes: "has-checked:border-emerald-700 has-checked:bg-emerald-700 has-checked:text-white",
  no: "has-checked:border-red-700 has-checked:bg-red-700 has-checked:text-white",
  na: "has-checked:border-stone-700 has-checked:bg-stone-700 has-checked:text-white",
};

/** "items[3].answer" (the server's path) → "items.3.answer" (the form's name). */
const fieldNameOf = (path: string) => path.replace(/\[(\d+)\]/g, ".$1");

function isRetryable(error: unknown): boolean {
  // No answer (offline, cut off), the server or database away, or throttled: send the same copy again.
  return error instanceof ApiError && (error.status === 0 || error.status >= 500 || error.status === 429);
}

function newValues(checklist: readonly ChecklistItem[]): FormValues {
  return {
    idempotencyKey: crypto.randomUUID(),
    items: checklist.map((item) => ({ id: item.id, answer: "", note: "", photoId: null })),
    note: "",
  };
}

export function PreUseCheckForm({
  permitId,
  userId,
  checklist,
}: {
  permitId: string;
  userId: string;
  checklist: ChecklistItem[];
}) {
  const [initial] = useState(() => newValues(checklist));
  const form = useForm<FormValues>({
    resolver: zodResolver(recordCheckSchema) as unknown as Resolver<FormValues>,
    defaultValues: initial,
    mode: "onTouched",
  });
  const draft = useBrowserDraft(form, `pre-use-check.${userId}.${permitId}`);
  const [state, setState] = useState<SendState>({ kind: "idle" });
  const [failure, setFailure] = useState<string | null>(null);
  const pending = useRef<FormValues | null>(null);
  const attempt = useRef(0);
  const answers = useWatch({ control: form.control, name: "items" });
  const errors = form.formState.errors;

  const send = useCallback(async () => {
    const values = pending.current;
    if (!values) return;
    setState({ kind: "sending" });
    try {
      const result = await apiFetch<Recorded>(`/api/permits/${permitId}/checks`, {
        body: recordCheckSchema.parse(values),
      });
      pending.current = null;
      draft.clear();
      setState({ kind: "done", check: result.check });
    } catch (error) {
      if (isRetryable(error)) {
        const delayMs = RETRY_DELAYS_MS[Math.min(attempt.current, RETRY_DELAYS_MS.length - 1)];
        attempt.current += 1;
        setState({
          kind: "waiting",
          delayMs,
          message:
            (error as ApiError).status === 0
              ? "No connection: the check is not recorded yet. Your answers are kept on this phone and sent again when the signal returns."
              : "The server did not take the check yet. Your answers are kept on this phone and sent again shortly.",
        });
        return;
      }
      pending.current = null;
      applyApiIssues(error, form.setError, { nameOf: fieldNameOf });
      setFailure(error instanceof Error ? error.message : "The check could not be recorded.");
      setState({ kind: "idle" });
    }
  }, [draft, form, permitId]);

  // While a copy waits: send it again after the back-off, or at once when the phone is back online.
  useEffect(() => {
    if (state.kind !== "waiting") return;
    const retry = () => void send();
    const timer = setTimeout(retry, state.delayMs);
    window.addEventListener("online", retry);
    return () => {
      clearTimeout(timer);
      window.removeEventListener("online", retry);
    };
  }, [state, send]);

  // Built at the event, not during render: the handler keeps the submitted copy in a ref.
  const onSubmit = (event: React.FormEvent<HTMLFormElement>) =>
    form.handleSubmit(
      (values) => {
        setFailure(null);
        pending.current = values;
        attempt.current = 0;
        void send();
      },
      () => setFailure("Answer every item; each one still open is marked."),
    )(event);

  if (state.kind === "done") {
    const time = new Date(state.check.checkedAt).toLocaleTimeString([], { hour: "2-digit", minute: "2-digit" });
    return (
      <div className="flex flex-col gap-4" data-testid="check-recorded">
        <Alert tone={state.check.anyNo ? "error" : "success"} live title={`Check recorded at ${time}`}>
          {state.check.anyNo
            ? "Something was answered “no”: the holder and the safety officers have been e-mailed. Do not run the set-up until it is put right and a new check is recorded."
            : "Every item is in order or does not apply."}
        </Alert>
        <div className="flex flex-col gap-2 sm:flex-row">
          <Link href={`/permits/${permitId}`} className={buttonClasses({ className: "h-12 text-base" })}>
            Back to the permit
          </Link>
          <button
            type="button"
            className={buttonClasses({ variant: "secondary", className: "h-12 text-base" })}
            onClick={() => {
              form.reset(newValues(checklist));
              setState({ kind: "idle" });
            }}
          >
            Record another check
          </button>
        </div>
      </div>
    );
  }

  const waiting = state.kind === "waiting" || state.kind === "sending";
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Pre-use check">
      {draft.restoredAt && (
        <Alert tone="info" title="Your answers are back">
          What you answered on this phone earlier was not recorded yet; it is filled in below.{" "}
          <button type="button" className="min-h-11 font-medium underline" onClick={draft.discard}>
            Start again
          </button>
        </Alert>
      )}
      <ol className="flex flex-col gap-3">
        {checklist.map((item, index) => (
          <CheckItem
            key={item.id}
            item={item}
            index={index}
            answer={answers?.[index]?.answer ?? ""}
            photoId={answers?.[index]?.photoId ?? null}
            permitId={permitId}
            register={form.register}
            onPhoto={(id) => form.setValue(`items.${index}.photoId`, id, { shouldDirty: true, shouldValidate: false })}
            error={
              errors.items?.[index]?.answer?.message ??
              errors.items?.[index]?.note?.message ??
              errors.items?.[index]?.photoId?.message ??
              errors.items?.[index]?.id?.message
            }
          />
        ))}
      </ol>
      <label className="flex flex-col gap-1 text-sm font-medium text-stone-800">
        Note on the whole check (optional)
        <textarea
          rows={2}
          maxLength={1000}
          className="rounded-md border border-stone-300 px-3 py-2 text-base font-normal"
          {...form.register("note")}
        />
      </label>
      <div aria-live="polite" className="flex flex-col gap-2">
        {failure && <Alert tone="error">{failure}</Alert>}
        {errors.items?.message && <Alert tone="error">{errors.items.message}</Alert>}
        {errors.items?.root?.message && <Alert tone="error">{errors.items.root.message}</Alert>}
        {state.kind === "waiting" && (
          <Alert tone="warn" title="Not sent yet" className="items-start">
            <p>{state.message}</p>
            <button
              type="button"
              className={buttonClasses({ variant: "secondary", className: "mt-2 h-11" })}
              onClick={() => void send()}
            >
              Send again now
            </button>
          </Alert>
        )}
      </div>
      <button
        type="submit"
        disabled={state.kind === "sending"}
        className={buttonClasses({ className: "h-12 w-full text-base" })}
      >
        {state.kind === "sending" ? "Sending…" : waiting ? "Record the check (waiting to send)" : "Record the check"}
      </button>
    </form>
  );
}

function CheckItem({
  item,
  index,
  answer,
  photoId,
  permitId,
  register,
  onPhoto,
  error,
}: {
  item: ChecklistItem;
  index: number;
  answer: Answer | "";
  photoId: string | null;
  permitId: string;
  register: ReturnType<typeof useForm<FormValues>>["register"];
  onPhoto: (id: string | null) => void;
  error?: string;
}) {
  const [more, setMore] = useState(false);
  const [photoState, setPhotoState] = useState<string | null>(null);
  const open = more || answer === "no" || photoId !== null;
  const headingId = `check-item-${index}`;

  async function upload(file: File) {
    setPhotoState("Sending the photo…");
    const body = new FormData();
    body.set("file", file);
    try {
      const res = await fetch(`/api/permits/${permitId}/checks/photos`, {
        method: "POST",
        body,
        credentials: "same-origin",
      });
      const json = (await res.json().catch(() => undefined)) as
        { photo?: { id: string }; error?: { message?: string } } | undefined;
      if (!res.ok || !json?.photo) {
        setPhotoState(json?.error?.message ?? "The photo was not accepted.");
        return;
      }
      onPhoto(json.photo.id);
      setPhotoState("Photo added.");
    } catch {
      setPhotoState("No connection: the photo was not sent. Add it again when the signal returns.");
    }
  }

  return (
    <li
      className={cx(
        "rounded-lg border bg-white p-3",
        error ? "border-red-700" : answer === "no" ? "border-red-300" : "border-stone-200",
      )}
    >
      <fieldset aria-describedby={error ? `${headingId}-error` : undefined}>
        <legend id={headingId} className="text-base font-medium text-stone-900">
          {item.text}
          {item.group === "condition" && (
            <span className="block text-xs font-normal text-stone-600">Condition of the permit</span>
          )}
        </legend>
        <input type="hidden" {...register(`items.${index}.id`)} />
        <div className="mt-2 grid grid-cols-3 gap-2">
          {PRE_USE_ANSWERS.map((value) => (
            <label
              key={value}
              className={cx(
                "flex min-h-12 cursor-pointer items-center justify-center rounded-md border border-stone-300 bg-white px-2 text-center text-base font-medium text-stone-800",
                "has-focus-visible:outline-2 has-focus-visible:outline-offset-2 has-focus-visible:outline-ink-600",
                ANSWER_LOOK[value],
              )}
            >
              <input type="radio" value={value} className="sr-only" {...register(`items.${index}.answer`)} />
              {ANSWER_LABELS[value]}
            </label>
          ))}
        </div>
        <p id={`${headingId}-error`} className="text-sm text-red-800" aria-live="polite">
          {error}
        </p>
        {!open ? (
          <button
            type="button"
            className="mt-1 min-h-11 text-sm font-medium text-ink-700 underline"
            onClick={() => setMore(true)}
          >
            Add a note or photo
          </button>
        ) : (
          <div className="mt-2 flex flex-col gap-2">
            <label className="flex flex-col gap-1 text-sm text-stone-800">
              Note {answer === "no" ? "(what is wrong?)" : "(optional)"}
              <input
                type="text"
                maxLength={CHECK_NOTE_MAX}
                className="min-h-11 rounded-md border border-stone-300 px-3 text-base"
                {...register(`items.${index}.note`)}
              />
            </label>
            <div className="flex flex-wrap items-center gap-2">
              <label className={buttonClasses({ variant: "secondary", className: "h-11 cursor-pointer" })}>
                {photoId ? "Replace the photo" : "Add a photo"}
                <input
                  type="file"
                  accept="image/jpeg,image/png,image/webp"
                  capture="environment"
                  className="sr-only"
                  onChange={(event) => {
                    const file = event.target.files?.[0];
                    if (file) void upload(file);
                    event.target.value = "";
                  }}
                />
              </label>
              {photoId && (
                <button
                  type="button"
                  className="min-h-11 px-2 text-sm text-stone-700 underline"
                  onClick={() => {
                    onPhoto(null);
                    setPhotoState(null);
                  }}
                >
                  Remove the photo
                </button>
              )}
            </div>
            {photoState && (
              <p className="text-sm text-stone-700" aria-live="polite">
                {photoState}
              </p>
            )}
          </div>
        )}
      </fieldset>
    </li>
  );
}
