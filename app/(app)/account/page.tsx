import type { Metadata } from "next";
import { Card } from "@/app/_components/card";
import { PageHeader } from "@/app/_components/page-header";
import { requirePageUser } from "@/lib/auth/guards";
import { ROLE_LABELS } from "@/lib/roles";
import { hasCalendarFeed } from "@/lib/calendar/queries";
import { TrainingRecordsTable } from "@/app/_components/training/records-table";
import { institutionToday } from "@/lib/permits/queries";
import { recordsOf } from "@/lib/training/queries";
import { CalendarFeed } from "./calendar-feed";
import { ChangePasswordForm } from "./change-password-form";

export const metadata: Metadata = { title: "Your account" };

export default async function AccountPage() {
  const user = await requirePageUser(undefined, "/account");
  return (
    <>
      <PageHeader title="Your account" description={`${user.name} · ${user.email}`} />
      <div className="grid max-w-3xl gap-6 md:grid-cols-2">
        <Card title="Roles">
          <ul className="list-disc pl-5 text-sm text-stone-800">
            {user.roles.map((r) => (
              <li key={r}>{ROLE_LABELS[r]}</li>
            ))}
          </ul>
          <p className="mt-3 text-xs text-stone-600">An admin sets roles and departments.</p>
        </Card>
        <Card title="Change password">
          <ChangePasswordForm />
        </Card>
        <Card title="Calendar feed">
          <CalendarFeed exists={await hasCalendarFeed(user.id)} />
        </Card>
        <Card title="Your training" className="md:col-span-2" flush>
          <TrainingRecordsTable
            records={await recordsOf(user, user.id, await institutionToday())}
            caption="Your training"
          />
        </Card>
      </div>
    </>
  );
}
