"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field } from "@/app/_components/field";
import { apiFetch } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import { newPasswordSchema } from "@/lib/auth/schemas";

const formSchema = z
  .object({
    currentPassword: z.string().min(1, "Enter your current password."),
    newPassword: newPasswordSchema,
    confirm: z.string(),
  })
  .refine((v) => v.newPassword === v.confirm, { path: ["confirm"], message: "The two passwords differ." });
type FormValues = z.infer<typeof formSchema>;

export function ChangePasswordForm() {
  const [status, setStatus] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormValues>({ resolver: zodResolver(formSchema) });

  const onSubmit = handleSubmit(async ({ currentPassword, newPassword }) => {
    setStatus(null);
    try {
      await apiFetch("/api/me/password", { body: { currentPassword, newPassword } });
      reset();
      setStatus({ tone: "success", text: "Password changed. Your other sessions have been signed out." });
    } catch (e) {
      const handled = applyApiIssues(e, setError, { fields: ["currentPassword", "newPassword"] });
      if (!handled) setStatus({ tone: "error", text: e instanceof Error ? e.message : "Not changed." });
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <div aria-live="polite">
        {status && (
          <Alert tone={status.tone} live>
            {status.text}
          </Alert>
        )}
      </div>
      <Field
        label="Current password"
        type="password"
        autoComplete="current-password"
        {...register("currentPassword")}
        error={errors.currentPassword?.message}
      />
      <Field
        label="New password"
        type="password"
        autoComplete="new-password"
        hint="At least 12 characters."
        {...register("newPassword")}
        error={errors.newPassword?.message}
      />
      <Field
        label="Repeat the new password"
        type="password"
        autoComplete="new-password"
        {...register("confirm")}
        error={errors.confirm?.message}
      />
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? "Saving…" : "Change password"}
      </Button>
    </form>
  );
}
