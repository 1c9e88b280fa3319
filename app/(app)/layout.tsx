import type { ReactNode } from "react";
import { AppShell } from "@/app/_components/app-shell";
import { NAV_ITEMS, type NavItem } from "@/app/_components/nav-items";
import { can, requireSignedInPage, type CurrentUser } from "@/lib/auth/guards";
import type { Permission } from "@/lib/auth/permissions";

// The signed-in frame. The user is checked here, before anything streams, so a signed-out or
// disabled visitor gets a real redirect; each page still checks its own permission.

const NAV_PERMISSION: Partial<Record<NavItem["key"], Permission>> = {
  dashboard: "workspace.use",
  apparatus: "apparatus.read",
  applications: "application.create",
  review: "application.review",
  permits: "apparatus.read",
  incidents: "incident.report",
  admin: "admin.users",
  training: "training.record",
  live: "live.read",
  reports: "report.read",
};

function visibleNav(user: CurrentUser): NavItem[] {
  return NAV_ITEMS.filter((item) => {
    const permission = NAV_PERMISSION[item.key];
    return !permission || can(user, permission);
  });
}

export default async function SignedInLayout({ children }: { children: ReactNode }) {
  // Signed in is enough for the frame: a responder's account sees it around the live sheet; every
  // page checks its own permission (requirePageUser asks for "workspace.use" by default).
  const user = await requireSignedInPage();
  return (
    <AppShell navItems={visibleNav(user)} user={{ name: user.name, roles: user.roles }} search={can(user, "search")}>
      {children}
    </AppShell>
  );
}
