import Link from "next/link";
import type { ReactNode } from "react";
import { AboutFigures } from "./about-figures";
import { Wordmark } from "./logo";
import { Nav } from "./nav";
import { SearchForm } from "./search-form";
import type { NavItem } from "./nav-items";
import { UserMenu, type ShellUser } from "./user-menu";

type AppShellProps = {
  /** Navigation items this user may see (filter NAV_ITEMS by permission before passing). */
  navItems: readonly NavItem[];
  user: ShellUser | null;
  /** Whether to show the search box (the user holds the "search" permission). */
  search?: boolean;
  children: ReactNode;
};

/** The signed-in frame: skip link, header with mark, navigation and user menu; main; the note about the figures in the footer. */
export function AppShell({ navItems, user, search = false, children }: AppShellProps) {
  return (
    <div className="flex min-h-dvh flex-col">
      <a
        href="#main"
        className="sr-only rounded-md bg-ink-800 text-sm font-medium text-white focus:not-sr-only focus:fixed focus:top-2 focus:left-2 focus:z-50 focus:px-3 focus:py-2"
      >
        Skip to main content
      </a>

      <header className="relative z-20 border-b border-stone-200 bg-white">
        <div className="mx-auto flex h-14 max-w-shell items-center gap-4 px-4 sm:px-6 lg:gap-8">
          <Link href="/" className="-m-1 shrink-0 rounded-md p-1 no-underline" aria-label="Benchclear — dashboard">
            <Wordmark />
          </Link>
          <div className="ml-auto flex h-full items-center md:ml-0">
            <Nav items={navItems}>
              {search && <SearchForm variant="header" id="menu-search" className="mb-3" />}
              {user && <UserMenu user={user} layout="stack" />}
            </Nav>
          </div>
          {search && (
            <>
              {/* The row is full of navigation until wide screens: a link to the search page until then. */}
              <Link
                href="/search"
                className="ml-auto hidden rounded-md px-2 py-1 text-sm font-medium text-stone-700 hover:text-stone-900 md:block xl:hidden"
              >
                Search
              </Link>
              <SearchForm variant="header" className="ml-auto hidden xl:flex" />
            </>
          )}
          <UserMenu user={user} className={search ? "hidden md:flex" : "ml-auto hidden md:flex"} />
        </div>
      </header>

      <main
        id="main"
        tabIndex={-1}
        className="mx-auto w-full max-w-shell flex-1 px-4 py-6 outline-none sm:px-6 sm:py-8"
      >
        {children}
      </main>

      <footer className="border-t border-stone-200 bg-white">
        <div className="mx-auto flex max-w-shell flex-col gap-2 px-4 py-4 sm:px-6 md:flex-row md:items-start md:justify-between md:gap-8">
          <AboutFigures variant="compact" className="max-w-3xl" />
          <p className="shrink-0 text-xs leading-5 text-stone-500">
            Benchclear advises; it does not replace a qualified person.
          </p>
        </div>
      </footer>
    </div>
  );
}
