"use client";

import { useRef, useState, type FormEvent } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";

// Checked in the browser with two plain rules, neither the shared zod schema nor a form library: zod
// would be about 45 kB (gzip) and react-hook-form about 9 kB of the first page everyone loads, where
// the budget is 10 kB over the framework's own runtime (docs/performance.md). The server checks the
// same fields again (lib/auth) and answers 422 naming the field.
type FormValues = { email: string; password: string };
type FormErrors = Partial<Record<keyof FormValues, string>>;
const EMAIL_SHAPE = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

function emailProblem(value: string): string | undefined {
  const email = value.trim();
  if (!email) return "Enter your e-mail address.";
  return EMAIL_SHAPE.test(email) ? undefined : "Enter a valid e-mail address.";
}

function problems(values: FormValues): FormErrors {
  const found: FormErrors = {};
  const email = emailProblem(values.email);
  if (email) found.email = email;
  if (!values.password) found.password = "Enter your password.";
  return found;
}

export function SignInForm({ from }: { from: string }) {
  const [error, setError] = useState<string | null>(null);
  const [errors, setErrors] = useState<FormErrors>({});
  const [isSubmitting, setSubmitting] = useState(false);
  // After the first submit, each change re-checks the form, so a fixed field's message goes at once.
  const submitted = useRef(false);
  const formRef = useRef<HTMLFormElement>(null);

  const valuesOf = (form: HTMLFormElement): FormValues => {
    const data = new FormData(form);
    return { email: String(data.get("email") ?? ""), password: String(data.get("password") ?? "") };
  };

  const onChange = () => {
    if (submitted.current && formRef.current) setErrors(problems(valuesOf(formRef.current)));
  };

  const onSubmit = async (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    if (isSubmitting) return;
    submitted.current = true;
    const form = event.currentTarget;
    const values = valuesOf(form);
    const found = problems(values);
    setErrors(found);
    const first = (Object.keys(found) as (keyof FormValues)[])[0];
    if (first) {
      (form.elements.namedItem(first) as HTMLInputElement | null)?.focus();
      return;
    }
    setError(null);
    setSubmitting(true);
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
    } finally {
      setSubmitting(false);
    }
  };

  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} noValidate className="mt-6 flex flex-col gap-4">
      <div aria-live="assertive">
        {error && (
          <Alert tone="error" live>
            {error}
          </Alert>
        )}
      </div>
      <Field label="E-mail" type="email" autoComplete="username" name="email" error={errors.email} />
      <Field label="Password" type="password" autoComplete="current-password" name="password" error={errors.password} />
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? "Signing in…" : "Sign in"}
      </Button>
      <p className="text-xs text-stone-600">
        No account? Ask your institution&rsquo;s Benchclear admin for an invitation.
      </p>
    </form>
  );
}
