import Link from "next/link";
import { SignOutButton } from "./sign-out-button";
import { isRole, ROLE_LABELS } from "@/lib/roles";
import { cx } from "./cx";

export type ShellUser = { name: string; roles: readonly string[] };

type UserMenuProps = {
  user: ShellUser | null;
  /** "row" for the header on wide screens, "stack" for the phone menu. */
  layout?: "row" | "stack";
  className?: string;
};

export function roleLabel(role: string): string {
  if (isRole(role)) return ROLE_LABELS[role];
  const words = role.replace(/[_-]+/g, " ").trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Who is signed in (linking to their account page), their roles, and a sign-out button. Renders nothing when no one is signed in. */
export function UserMenu({ user, layout = "row", className }: UserMenuProps) {
  if (!user) return null;
  const roles = user.roles.map(roleLabel).join(", ");
  return (
    <div
      className={cx(
        "flex min-w-0 gap-3",
        layout === "row" ? "items-center" : "items-center justify-between",
        className,
      )}
    >
      <div className={cx("min-w-0 leading-tight", layout === "row" && "text-right")}>
        <Link
          href="/account"
          className="block truncate text-sm font-medium text-stone-900 no-underline hover:underline"
        >
          {user.name}
        </Link>
        {roles && (
          <p className="truncate text-xs text-stone-600">
            <span className="sr-only">Roles: </span>
            {roles}
          </p>
        )}
      </div>
      <SignOutButton />
    </div>
  );
}
