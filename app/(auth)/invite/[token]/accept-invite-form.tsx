"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
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
  .object({ password: newPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });
type FormValues = z.infer<typeof formSchema>;

export function AcceptInviteForm({ token }: { token: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError: setFieldError,
    formState: { errors, isSubmitting },
  } = useForm<FormValues>({ resolver: zodResolver(formSchema) });

  const onSubmit = handleSubmit(async ({ password }) => {
    setError(null);
    try {
      await apiFetch("/api/invitations/accept", { body: { token, password } });
      router.replace("/");
      router.refresh();
    } catch (e) {
      if (!applyApiIssues(e, setFieldError, { fields: ["password"] }))
        setError(e instanceof Error ? e.message : "That did not work.");
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="mt-6 flex flex-col gap-4">
      <div aria-live="assertive">
        {error && (
          <Alert tone="error" live>
            {error}
          </Alert>
        )}
      </div>
      <Field
        label="New password"
        type="password"
        autoComplete="new-password"
        {...register("password")}
        error={errors.password?.message}
      />
      <Field
        label="Repeat it"
        type="password"
        autoComplete="new-password"
        {...register("confirm")}
        error={errors.confirm?.message}
      />
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? "Saving…" : "Set password and sign in"}
      </Button>
    </form>
  );
}
