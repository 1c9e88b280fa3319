"use client";

import { useEffect, useState } from "react";
import type { UseFormReturn } from "react-hook-form";
import type { ApplicationDraft } from "@/lib/applications/schemas";

/** True from the user's first edit on (an input event; values the form sets itself do not count). */
export function useFirstEdit(form: UseFormReturn<ApplicationDraft>): boolean {
  const [edited, setEdited] = useState(false);
  useEffect(() => {
    if (edited) return;
    const subscription = form.watch((_values, { type }) => {
      if (type === "change") setEdited(true);
    });
    return () => subscription.unsubscribe();
  }, [form, edited]);
  return edited;
}
