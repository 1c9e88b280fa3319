"use client";

import { useMutation } from "@tanstack/react-query";
import { useEffect, useState } from "react";
import type { UseFormReturn } from "react-hook-form";
import { ApiError, apiFetch } from "@/lib/client/api";
import type { ApplicationDraft } from "@/lib/applications/schemas";

// Debounced autosave of the whole draft to PostgreSQL through the API. One save at a time, each
// carrying the version it edits (409 when the draft was saved elsewhere). A failed save keeps the
// form exactly as typed and says so; network and server errors are retried with growing pauses,
// a conflict or a refusal waits for the user.
// A new application is stored on the first edit the user makes (typing, picking a record), never on
// opening the page or on values the form fills in itself. Leaving the form (an in-app link, Back)
// sends a pending change at once instead of dropping it with the timer.

export const AUTOSAVE_DELAY_MS = 800;
const FIRST_RETRY_MS = 2_000;
const LONGEST_RETRY_MS = 30_000;

export type SaveStatus =
  | { kind: "idle" }
  | { kind: "saving" }
  | { kind: "saved"; at: Date }
  | { kind: "retrying"; message: string }
  | { kind: "conflict"; message: string }
  | { kind: "refused"; message: string };

/** One object, so setting it again while already saving does not render again. */
const SAVING: SaveStatus = { kind: "saving" };

type SaveResult = { id: string; version: number };

/** JSON with object keys in a fixed order, to tell whether two drafts say the same thing. */
function canonical(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) =>
    v && typeof v === "object" && !Array.isArray(v)
      ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => a.localeCompare(b)))
      : v,
  );
}
type SaveInput = { id: string | null; version: number; draft: ApplicationDraft; step: number };

async function saveRequest({ id, version, draft, step }: SaveInput): Promise<SaveResult> {
  if (!id) {
    const created = await apiFetch<{ application: SaveResult }>("/api/applications", { body: { draft } });
    return created.application;
  }
  const saved = await apiFetch<{ application: { version: number } }>(`/api/applications/${id}/draft`, {
    method: "PATCH",
    body: { expectedVersion: version, step, draft },
  });
  return { id, version: saved.application.version };
}

/** The saving machinery, outside React's render: timers, the one save in flight, the version. */
class Autosaver {
  id: string | null;
  version: number;
  step = 1;
  dirty = false;
  blocked = false;
  /** The user has changed something since the page opened (a new draft is created only then). */
  edited = false;
  /** The form was unmounted: one last save, no retries. */
  private left = false;
  private inFlight: Promise<boolean> | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private retryMs = FIRST_RETRY_MS;
  save: (input: SaveInput) => Promise<SaveResult> = saveRequest;
  onCreated: (id: string) => void = () => undefined;

  constructor(
    private readonly form: UseFormReturn<ApplicationDraft>,
    private setStatus: (status: SaveStatus) => void,
    id: string | null,
    version: number,
  ) {
    this.id = id;
    this.version = version;
  }

  /** The newest step, callback and request function from React (set after each render). */
  configure(options: {
    step: number;
    onCreated: (id: string) => void;
    save: (input: SaveInput) => Promise<SaveResult>;
  }) {
    this.step = options.step;
    this.onCreated = options.onCreated;
    this.save = options.save;
  }

  /** After an action that moved the version on (submit, withdraw). */
  setVersion(version: number) {
    this.version = version;
  }

  get busy(): boolean {
    return this.dirty || this.inFlight !== null;
  }

  schedule(ms: number) {
    this.cancel();
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.run();
    }, ms);
  }

  cancel() {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  /** `byUser`: typed or picked by the user, as opposed to a value the form filled in itself. */
  markDirty(byUser = true) {
    if (byUser) this.edited = true;
    // Nothing is stored for a new application until the user has changed something.
    if (!this.id && !this.edited) return;
    this.dirty = true;
    if (this.blocked) return;
    // "Saved" only ever means everything typed is saved: a pending change already reads as saving.
    this.setStatus(SAVING);
    this.schedule(AUTOSAVE_DELAY_MS);
  }

  async run(): Promise<boolean> {
    while (this.inFlight) await this.inFlight;
    if (!this.dirty) return !this.blocked;
    this.dirty = false;
    const attempt = this.attempt();
    this.inFlight = attempt;
    try {
      return await attempt;
    } finally {
      this.inFlight = null;
    }
  }

  private async attempt(retried = false): Promise<boolean> {
    this.setStatus(SAVING);
    const draft = structuredClone(this.form.getValues());
    const step = this.step;
    const creating = !this.id;
    try {
      const result = await this.save({ id: this.id, version: this.version, draft, step });
      if (creating) {
        this.id = result.id;
        this.onCreated(result.id);
        // A new draft starts at step 1 on the server; the step the user is on goes with the next save.
        if (step !== 1) this.dirty = true;
      }
      this.version = result.version;
      this.retryMs = FIRST_RETRY_MS;
      this.blocked = false;
      if (this.dirty) {
        this.setStatus(SAVING);
        if (!this.timer) this.schedule(AUTOSAVE_DELAY_MS);
      } else {
        this.setStatus({ kind: "saved", at: new Date() });
      }
      return true;
    } catch (error) {
      this.dirty = true;
      const status = error instanceof ApiError ? error.status : 0;
      const message = error instanceof Error ? error.message : "The draft was not saved.";
      if (status === 409 && !retried && this.id && (await this.sameAsSaved(draft))) {
        // The newer version says what this form says: it is this browser's own save, sent as the
        // previous page was left and landed after this one loaded. Not a conflict: save on top of it.
        this.dirty = false;
        return this.attempt(true);
      } else if (status === 409) {
        this.blocked = true;
        this.setStatus({ kind: "conflict", message });
      } else if (status >= 400 && status < 500 && status !== 401 && status !== 408 && status !== 429) {
        this.blocked = true;
        this.setStatus({ kind: "refused", message });
      } else {
        this.setStatus({ kind: "retrying", message });
        if (this.left) return false;
        this.schedule(this.retryMs);
        this.retryMs = Math.min(this.retryMs * 2, LONGEST_RETRY_MS);
      }
      return false;
    }
  }

  /**
   * The form is going away (an in-app link, Back): a change still waiting for its timer is sent now,
   * straight through fetch, because the component and its mutation hook are being unmounted.
   */
  leave() {
    this.cancel();
    this.left = true;
    if (!this.dirty || this.blocked) return;
    this.save = saveRequest;
    this.setStatus = () => undefined;
    this.onCreated = () => undefined;
    void this.run();
  }

  /** Saves now (before moving on, uploading or submitting); true when everything is saved. */
  async flush(): Promise<boolean> {
    this.cancel();
    this.blocked = false;
    return this.run();
  }

  /** Whether the saved draft equals `draft`; if so, its version becomes the one this form edits. */
  private async sameAsSaved(draft: ApplicationDraft): Promise<boolean> {
    try {
      const res = await apiFetch<{ application: { version: number; draft: ApplicationDraft } }>(
        `/api/applications/${this.id}/draft`,
      );
      if (canonical(res.application.draft) !== canonical(draft)) return false;
      this.version = res.application.version;
      return true;
    } catch {
      return false;
    }
  }

  /** After a conflict: take the saved version from the server and drop what was typed here. */
  async loadSaved() {
    if (!this.id) return;
    const res = await apiFetch<{ application: { version: number; draft: ApplicationDraft } }>(
      `/api/applications/${this.id}/draft`,
    );
    this.version = res.application.version;
    this.form.reset(res.application.draft);
    // The reset itself is not an edit: nothing is left to save.
    this.cancel();
    this.dirty = false;
    this.blocked = false;
    this.setStatus({ kind: "saved", at: new Date() });
  }

  /** After a conflict: save what is on screen over the version saved elsewhere. */
  async keepMine() {
    if (!this.id) return;
    const res = await apiFetch<{ application: { version: number } }>(`/api/applications/${this.id}/draft`);
    this.version = res.application.version;
    this.dirty = true;
    this.blocked = false;
    await this.run();
  }
}

type Options = {
  form: UseFormReturn<ApplicationDraft>;
  initialId: string | null;
  initialVersion: number;
  initialSavedAt: Date | null;
  /** The step on screen, saved with the draft so that reopening resumes there. */
  step: number;
  /** Called once the first save created the draft. */
  onCreated: (id: string) => void;
};

export function useAutosave({ form, initialId, initialVersion, initialSavedAt, step, onCreated }: Options) {
  const [status, setStatus] = useState<SaveStatus>(
    initialSavedAt ? { kind: "saved", at: initialSavedAt } : { kind: "idle" },
  );
  const [saver] = useState(() => new Autosaver(form, setStatus, initialId, initialVersion));
  const mutation = useMutation({ mutationFn: saveRequest });
  const { mutateAsync } = mutation;

  useEffect(() => {
    saver.configure({ step, onCreated, save: mutateAsync });
  }, [saver, step, onCreated, mutateAsync]);

  useEffect(() => {
    // react-hook-form marks what an input event changed with its type; setValue and field-array
    // changes made by the form itself come without one.
    const subscription = form.watch((_values, { type }) => saver.markDirty(type === "change"));
    const warn = (event: BeforeUnloadEvent) => {
      if (saver.busy) event.preventDefault();
    };
    window.addEventListener("beforeunload", warn);
    return () => {
      subscription.unsubscribe();
      window.removeEventListener("beforeunload", warn);
      saver.leave();
    };
  }, [form, saver]);

  return { status, saving: mutation.isPending, saver };
}

const timeFormat = new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit" });

/** "Saving…", "Saved 12:04", "Not saved — retrying". */
export function statusText(status: SaveStatus): string {
  switch (status.kind) {
    case "idle":
      return "Not saved yet";
    case "saving":
      return "Saving…";
    case "saved":
      return `Saved ${timeFormat.format(status.at)}`;
    case "retrying":
      return "Not saved — retrying";
    case "conflict":
      return "Not saved — changed elsewhere";
    case "refused":
      return "Not saved";
  }
}
