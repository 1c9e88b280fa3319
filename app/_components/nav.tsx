"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useId, useRef, useState, type KeyboardEvent, type ReactNode } from "react";
import { cx } from "./cx";
import { isCurrent, type NavItem } from "./nav-items";

type NavProps = {
  /** The items this user may see, already filtered. */
  items: readonly NavItem[];
  /** Extra content at the foot of the phone menu, e.g. the user menu. */
  children?: ReactNode;
};

/**
 * Main navigation. Wide screens: a row of links. Phones: a disclosure button that opens the list
 * under the header. The current page carries aria-current="page".
 */
export function Nav({ items, children }: NavProps) {
  const pathname = usePathname() ?? "/";
  const panelId = useId();
  const buttonRef = useRef<HTMLButtonElement>(null);
  // The menu stays open only on the path it was opened on, so navigating closes it without an effect.
  const [openOn, setOpenOn] = useState<string | null>(null);
  const open = openOn === pathname;

  function close(returnFocus: boolean) {
    setOpenOn(null);
    if (returnFocus) buttonRef.current?.focus();
  }

  function onKeyDown(e: KeyboardEvent) {
    if (e.key === "Escape" && open) {
      e.preventDefault();
      close(true);
    }
  }

  return (
    <nav aria-label="Main" className="flex items-center md:h-full" onKeyDown={onKeyDown}>
      <ul className="hidden h-full items-stretch gap-1 md:flex">
        {items.map((item) => {
          const current = isCurrent(item, pathname);
          return (
            <li key={item.key} className="flex">
              <Link
                href={item.href}
                aria-current={current ? "page" : undefined}
                className={cx(
                  "-mb-px flex items-center border-b-2 px-2.5 text-sm font-medium no-underline transition-colors lg:px-3",
                  current
                    ? "border-ink-700 text-ink-900"
                    : "border-transparent text-stone-600 hover:border-stone-300 hover:text-stone-900",
                )}
              >
                {item.label}
              </Link>
            </li>
          );
        })}
      </ul>

      <button
        ref={buttonRef}
        type="button"
        className="inline-flex h-10 items-center gap-2 rounded-md border border-stone-300 bg-white px-3 text-sm font-medium text-stone-800 md:hidden"
        aria-expanded={open}
        aria-controls={panelId}
        onClick={() => setOpenOn(open ? null : pathname)}
      >
        <MenuIcon open={open} />
        Menu
      </button>

      <div
        id={panelId}
        hidden={!open}
        className="absolute inset-x-0 top-full z-30 border-b border-stone-200 bg-white shadow-md md:hidden"
      >
        <ul className="mx-auto flex max-w-shell flex-col px-3 py-2">
          {items.map((item) => {
            const current = isCurrent(item, pathname);
            return (
              <li key={item.key}>
                <Link
                  href={item.href}
                  aria-current={current ? "page" : undefined}
                  onClick={() => close(false)}
                  className={cx(
                    "flex items-center rounded-md border-l-4 px-3 py-2.5 text-[0.9375rem] font-medium no-underline",
                    current
                      ? "border-ink-700 bg-ink-50 text-ink-900"
                      : "border-transparent text-stone-700 hover:bg-stone-50 hover:text-stone-900",
                  )}
                >
                  {item.label}
                </Link>
              </li>
            );
          })}
        </ul>
        {children && <div className="mx-auto max-w-shell border-t border-stone-200 px-6 py-3">{children}</div>}
      </div>
    </nav>
  );
}

function MenuIcon({ open }: { open: boolean }) {
  return (
    <svg viewBox="0 0 20 20" className="size-4" aria-hidden="true" focusable="false">
      {open ? (
        <path d="m5 5 10 10M15 5 5 15" stroke="currentColor" strokeWidth="1.75" strokeLinecap="round" />
      ) : (
        <path d="M3.5 6h13M3.5 10h13M3.5 14h13" stroke="currentColor" strokeWidth="1.75" strokeLinecap="round" />
      )}
    </svg>
  );
}
