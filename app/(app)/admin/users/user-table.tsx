"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/app/_components/button";
import { controlClasses } from "@/app/_components/field";
import { apiFetch } from "@/lib/client/api";
import { ROLE_OPTIONS, type Role } from "@/lib/roles";

export type UserRow = {
  id: string;
  name: string;
  email: string;
  roles: Role[];
  departmentId: string | null;
  disabled: boolean;
  hasPassword: boolean;
  lastSignIn: string;
};

/** The accounts table: each row edits roles and department in place, and disables or re-enables. */
export function UserTable({
  users,
  departments,
  selfId,
}: {
  users: UserRow[];
  departments: { id: string; name: string }[];
  selfId: string;
}) {
  return (
    <div role="region" aria-label="Accounts" tabIndex={0} className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <thead className="border-b border-stone-200 bg-stone-50 text-xs tracking-wide text-stone-600 uppercase">
          <tr>
            <th scope="col" className="px-4 py-2 font-medium">
              Person
            </th>
            <th scope="col" className="px-4 py-2 font-medium">
              Roles
            </th>
            <th scope="col" className="px-4 py-2 font-medium">
              Department
            </th>
            <th scope="col" className="px-4 py-2 font-medium">
              Status
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-stone-200">
          {users.map((u) => (
            <UserRowEditor key={u.id} user={u} departments={departments} isSelf={u.id === selfId} />
          ))}
        </tbody>
      </table>
    </div>
  );
}

function UserRowEditor({
  user,
  departments,
  isSelf,
}: {
  user: UserRow;
  departments: { id: string; name: string }[];
  isSelf: boolean;
}) {
  const router = useRouter();
  const [roles, setRoles] = useState<Role[]>(user.roles);
  const [departmentId, setDepartmentId] = useState(user.departmentId ?? "");
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const dirty =
    roles.slice().sort().join() !== user.roles.slice().sort().join() || departmentId !== (user.departmentId ?? "");

  async function save(body: Record<string, unknown>) {
    setBusy(true);
    setMessage(null);
    try {
      await apiFetch(`/api/admin/users/${user.id}`, { method: "PATCH", body });
      setMessage("Saved.");
      router.refresh();
    } catch (e) {
      setMessage(e instanceof Error ? e.message : "Not saved.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <tr className={user.disabled ? "bg-stone-50 text-stone-500" : undefined}>
      <th scope="row" className="px-4 py-3 align-top font-normal">
        <p className="font-medium text-stone-900">{user.name}</p>
        <p className="text-stone-600">{user.email}</p>
        <p className="text-xs text-stone-500">Last sign-in: {user.lastSignIn}</p>
      </th>
      <td className="px-4 py-3 align-top">
        <fieldset>
          <legend className="sr-only">Roles of {user.name}</legend>
          {ROLE_OPTIONS.map((r) => (
            <label key={r.value} className="flex items-center gap-2 whitespace-nowrap">
              <input
                type="checkbox"
                className="size-4"
                checked={roles.includes(r.value)}
                onChange={(e) =>
                  setRoles((prev) => (e.target.checked ? [...prev, r.value] : prev.filter((x) => x !== r.value)))
                }
              />
              {r.label}
            </label>
          ))}
        </fieldset>
      </td>
      <td className="px-4 py-3 align-top">
        <label className="sr-only" htmlFor={`dept-${user.id}`}>
          Department of {user.name}
        </label>
        <select
          id={`dept-${user.id}`}
          className={controlClasses}
          value={departmentId}
          onChange={(e) => setDepartmentId(e.target.value)}
        >
          <option value="">No department</option>
          {departments.map((d) => (
            <option key={d.id} value={d.id}>
              {d.name}
            </option>
          ))}
        </select>
        {dirty && (
          <Button
            size="sm"
            className="mt-2"
            disabled={busy || roles.length === 0}
            onClick={() => save({ roles, departmentId: departmentId || null })}
          >
            Save changes
          </Button>
        )}
      </td>
      <td className="px-4 py-3 align-top">
        <p>{user.disabled ? "Disabled" : user.hasPassword ? "Active" : "No password yet"}</p>
        {!isSelf && (
          <Button
            size="sm"
            variant={user.disabled ? "secondary" : "danger"}
            className="mt-2"
            disabled={busy}
            onClick={() => save({ disabled: !user.disabled })}
          >
            {user.disabled ? "Re-enable" : "Disable"}
          </Button>
        )}
        <p aria-live="polite" className="mt-1 text-xs text-stone-600">
          {message}
        </p>
      </td>
    </tr>
  );
}
