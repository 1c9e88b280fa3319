// The main navigation, in order. The signed-in layout filters this list by the user's permissions
// and passes the rest to <Nav>. Kept out of nav.tsx: a "use client" module's plain exports reach
// server components only as references.

export type NavItem = {
  key:
    | "dashboard"
    | "apparatus"
    | "applications"
    | "review"
    | "permits"
    | "incidents"
    | "live"
    | "reports"
    | "admin"
    | "training";
  href: string;
  label: string;
  /** Path prefix that also marks this item current; defaults to href. */
  match?: string;
};

export const NAV_ITEMS: readonly NavItem[] = [
  { key: "dashboard", href: "/", label: "Dashboard" },
  { key: "apparatus", href: "/apparatus", label: "Apparatus" },
  { key: "applications", href: "/applications", label: "Applications" },
  { key: "review", href: "/review", label: "Review" },
  { key: "permits", href: "/permits", label: "Permits" },
  { key: "incidents", href: "/incidents", label: "Incidents" },
  { key: "training", href: "/training", label: "Training" },
  { key: "live", href: "/live", label: "Live now" },
  { key: "reports", href: "/reports", label: "Reports" },
  { key: "admin", href: "/admin/users", label: "Admin", match: "/admin" },
];

export function isCurrent(item: NavItem, pathname: string): boolean {
  const prefix = item.match ?? item.href;
  if (prefix === "/") return pathname === "/";
  return pathname === prefix || pathname.startsWith(`${prefix}/`);
}
