"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { Field, FieldShell, controlClasses } from "@/app/_components/field";
import { apiFetch } from "@/lib/client/api";
import { applyApiIssues } from "@/lib/client/form-errors";
import { ROLE_OPTIONS, ROLES } from "@/lib/roles";

const formSchema = z.object({
  email: z.string().trim().min(1, "Enter an e-mail address.").email("Enter a valid e-mail address."),
  name: z.string().trim().min(1, "Enter the person's name.").max(120),
  roles: z.array(z.enum(ROLES)).min(1, "Choose at least one role."),
  departmentId: z.string(),
});
type FormValues = z.infer<typeof formSchema>;

export function InviteForm({ departments }: { departments: { id: string; name: string }[] }) {
  const router = useRouter();
  const [status, setStatus] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormValues>({
    resolver: zodResolver(formSchema),
    defaultValues: { roles: ["instructor"], departmentId: departments[0]?.id ?? "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setStatus(null);
    try {
      await apiFetch("/api/admin/invitations", { body: { ...values, departmentId: values.departmentId || null } });
      setStatus({ tone: "success", text: `Invitation sent to ${values.email}. The link works once, for 7 days.` });
      reset({ email: "", name: "", roles: ["instructor"], departmentId: values.departmentId });
      router.refresh();
    } catch (e) {
      applyApiIssues(e, setError, { fields: ["email", "name", "roles", "departmentId"] });
      setStatus({ tone: "error", text: e instanceof Error ? e.message : "The invitation was not sent." });
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
      <Field label="Name" autoComplete="off" {...register("name")} error={errors.name?.message} required />
      <Field
        label="E-mail"
        type="email"
        autoComplete="off"
        {...register("email")}
        error={errors.email?.message}
        required
      />
      <fieldset>
        <legend className="text-sm font-medium text-stone-800">Roles</legend>
        <div className="mt-1 grid grid-cols-2 gap-1">
          {ROLE_OPTIONS.map((r) => (
            <label key={r.value} className="flex items-center gap-2 text-sm text-stone-800">
              <input type="checkbox" value={r.value} {...register("roles")} className="size-4" />
              {r.label}
            </label>
          ))}
        </div>
        <p aria-live="polite" className="text-sm text-red-800">
          {errors.roles?.message}
        </p>
      </fieldset>
      <FieldShell label="Department" error={errors.departmentId?.message}>
        {(a11y) => (
          <select {...a11y} {...register("departmentId")} className={controlClasses}>
            <option value="">No department</option>
            {departments.map((d) => (
              <option key={d.id} value={d.id}>
                {d.name}
              </option>
            ))}
          </select>
        )}
      </FieldShell>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? "Sending…" : "Send invitation"}
      </Button>
    </form>
  );
}
