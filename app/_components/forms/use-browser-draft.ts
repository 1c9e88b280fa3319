"use client";

import { useEffect, useRef, useState } from "react";
import { useWatch, type FieldValues, type UseFormReturn } from "react-hook-form";

// A form's unsaved values kept in this browser (localStorage) as they are typed, and offered back when
// the same form is opened again: a reload, a wrong link or a crash loses nothing. The draft is removed
// once the form is saved or the user discards it. Keyed by the signed-in user and the record, so one
// person's draft is never offered to another on a shared computer.

const PREFIX = "benchclear.draft.";

type Stored<T> = { savedAt: string; values: T };

function read<T>(key: string): Stored<T> | null {
  try {
    const raw = window.localStorage.getItem(PREFIX + key);
    if (!raw) return null;
    const parsed = JSON.parse(raw) as Stored<T>;
    return parsed && typeof parsed === "object" && parsed.values ? parsed : null;
  } catch {
    return null;
  }
}

function write(key: string, values: unknown) {
  try {
    window.localStorage.setItem(PREFIX + key, JSON.stringify({ savedAt: new Date().toISOString(), values }));
  } catch {
    // Storage full or disabled (private mode): the leave warning still protects the typing.
  }
}

export function clearBrowserDraft(key: string) {
  try {
    window.localStorage.removeItem(PREFIX + key);
  } catch {
    // Nothing to clear.
  }
}

export function useBrowserDraft<T extends FieldValues>(form: UseFormReturn<T>, key: string) {
  const [restoredAt, setRestoredAt] = useState<Date | null>(null);
  const ready = useRef(false);
  const values = useWatch({ control: form.control });
  const { isDirty } = form.formState;

  // Once, after hydration: offer back what was typed here before (it was never saved).
  // (In a task of its own: the form has registered its fields, and the notice renders once.)
  useEffect(() => {
    const timer = setTimeout(() => {
      const stored = read<T>(key);
      if (stored) {
        form.reset(stored.values, { keepDefaultValues: true });
        setRestoredAt(new Date(stored.savedAt));
      }
      ready.current = true;
    }, 0);
    return () => clearTimeout(timer);
  }, [form, key]);

  // Every change is written at once (a few kilobytes; well under a millisecond), so leaving the page
  // right after a keystroke still keeps it.
  useEffect(() => {
    if (!ready.current) return;
    if (isDirty) write(key, form.getValues());
    else clearBrowserDraft(key);
  }, [values, isDirty, form, key]);

  return {
    restoredAt,
    /** Drops the browser draft and goes back to the saved values. */
    discard() {
      clearBrowserDraft(key);
      form.reset();
      setRestoredAt(null);
    },
    /** After a successful save: nothing is left to offer back. */
    clear() {
      clearBrowserDraft(key);
    },
  };
}
