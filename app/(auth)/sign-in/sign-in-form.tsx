"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";

// Checked in the browser with react-hook-form's own rules, not the shared zod schema: zod would be
// about 45 kB (gzip) of the first page everyone loads (docs/performance.md). The server checks the
// same fields again (lib/auth) and answers 422 naming the field.
type FormValues = { email: string; password: string };
const EMAIL_SHAPE = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

function emailProblem(value: string): true | string {
  const email = value.trim();
  if (!email) return "Enter your e-mail address.";
  return EMAIL_SHAPE.test(email) || "Enter a valid e-mail address.";
}

export function SignInForm({ from }: { from: string }) {
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<FormValues>();

  const onSubmit = handleSubmit(async (values) => {
    setError(null);
    try {
      const result = await apiFetch<{ redirectTo: string }>("/api/session", {
        body: { ...values, email: values.email.trim(), from },
      });
      // A full navigation, so every server component renders with the new session.
      window.location.assign(result.redirectTo);
    } catch (e) {
      if (e instanceof ApiError && e.status === 429 && e.retryAfterSeconds) {
        const minutes = Math.ceil(e.retryAfterSeconds / 60);
        setError(`Too many failed sign-ins. Try again in about ${minutes} minute${minutes === 1 ? "" : "s"}.`);
      } else {
        setError(e instanceof Error ? e.message : "Sign-in failed.");
      }
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
        label="E-mail"
        type="email"
        autoComplete="username"
        {...register("email", { validate: emailProblem })}
        error={errors.email?.message}
      />
      <Field
        label="Password"
        type="password"
        autoComplete="current-password"
        {...register("password", { required: "Enter your password." })}
        error={errors.password?.message}
      />
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? "Signing in…" : "Sign in"}
      </Button>
      <p className="text-xs text-stone-600">
        No account? Ask your institution&rsquo;s Benchclear admin for an invitation.
      </p>
    </form>
  );
}
