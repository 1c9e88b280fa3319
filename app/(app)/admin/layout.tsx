import Link from "next/link";
import type { ReactNode } from "react";
import { can, requirePageUser } from "@/lib/auth/guards";
import { env } from "@/lib/env";

// Tabs for the admin area. Each page still checks its own permission.
export default async function AdminLayout({ children }: { children: ReactNode }) {
  const user = await requirePageUser();
  const tabs = [
    { href: "/admin/users", label: "Users", show: can(user, "admin.users") },
    { href: "/admin/rules", label: "Rules", show: can(user, "admin.rules") },
    { href: "/admin/records", label: "Records", show: can(user, "admin.records") },
    { href: "/admin/training", label: "Course types", show: can(user, "training.courses") },
    { href: "/dev/mail", label: "Local inbox", show: can(user, "dev.mail") && env().MAIL_TRANSPORT === "local-inbox" },
  ].filter((t) => t.show);
  return (
    <>
      {tabs.length > 1 && (
        <nav aria-label="Administration" className="mb-6 flex gap-4 border-b border-stone-200 text-sm">
          {tabs.map((t) => (
            <Link
              key={t.href}
              href={t.href}
              className="-mb-px border-b-2 border-transparent px-1 pb-2 font-medium text-stone-700 no-underline hover:border-stone-400 hover:text-stone-900"
            >
              {t.label}
            </Link>
          ))}
        </nav>
      )}
      {children}
    </>
  );
}
