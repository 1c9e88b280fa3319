import type { Metadata } from "next";
import { Card } from "@/app/_components/card";
import { PageHeader } from "@/app/_components/page-header";
import { formatDateTime } from "@/app/_components/format";
import { institutionTimeZone } from "@/lib/settings/queries";
import { requirePageUser } from "@/lib/auth/guards";
import { listDepartments, listPendingInvitations, listUsers } from "@/lib/users/queries";
import { InviteForm } from "./invite-form";
import { UserTable } from "./user-table";

export const metadata: Metadata = { title: "Users" };

export default async function AdminUsersPage() {
  const admin = await requirePageUser("admin.users", "/admin/users");
  const [users, invitations, departments, timeZone] = await Promise.all([
    listUsers(admin),
    listPendingInvitations(admin),
    listDepartments(),
    institutionTimeZone(),
  ]);
  return (
    <>
      <PageHeader
        title="Users"
        description="Invite people, set their roles and department, and disable accounts. People set their own passwords."
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <Card title="Accounts" flush>
          <UserTable
            selfId={admin.id}
            departments={departments}
            users={users.map((u) => ({
              ...u,
              disabled: u.disabledAt !== null,
              lastSignIn: u.lastSignInAt ? formatDateTime(u.lastSignInAt, timeZone) : "never",
            }))}
          />
        </Card>
        <div className="flex flex-col gap-6">
          <Card title="Invite a person">
            <InviteForm departments={departments} />
          </Card>
          <Card title="Open invitations">
            {invitations.length === 0 ? (
              <p className="text-sm text-stone-600">No open invitations.</p>
            ) : (
              <ul className="divide-y divide-stone-200 text-sm">
                {invitations.map((inv) => (
                  <li key={inv.id} className="py-2">
                    <p className="font-medium text-stone-900">{inv.name}</p>
                    <p className="text-stone-600">{inv.email}</p>
                    <p className="text-xs text-stone-500">Link valid until {formatDateTime(inv.expiresAt, timeZone)}</p>
                  </li>
                ))}
              </ul>
            )}
          </Card>
        </div>
      </div>
    </>
  );
}
