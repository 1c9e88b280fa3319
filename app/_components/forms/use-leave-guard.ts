"use client";

import { useEffect, useRef } from "react";

// Asks before unsaved work is left behind, whichever way the user leaves: a reload or closing the tab
// (the browser's own dialog), a link inside the app (a click caught before Next.js's router sees it),
// and browser Back (one extra history entry for this same address, so Back first lands here and
// can be confirmed). The form keeps its draft either way; this only makes leaving a decision.

export const LEAVE_MESSAGE = "Leave this page? What you typed is not saved yet (a draft stays in this browser).";

const GUARD = "__benchclearLeaveGuard";

export function useLeaveGuard(dirty: boolean, message = LEAVE_MESSAGE) {
  const dirtyRef = useRef(dirty);
  useEffect(() => {
    dirtyRef.current = dirty;
  }, [dirty]);

  useEffect(() => {
    if (!dirty) return;
    const beforeUnload = (event: BeforeUnloadEvent) => {
      if (dirtyRef.current) event.preventDefault();
    };
    const click = (event: MouseEvent) => {
      if (!dirtyRef.current || event.defaultPrevented || event.button !== 0) return;
      if (event.metaKey || event.ctrlKey || event.shiftKey || event.altKey) return;
      const link = (event.target as Element | null)?.closest?.("a[href]");
      if (!(link instanceof HTMLAnchorElement) || link.target === "_blank" || link.hasAttribute("download")) return;
      const url = new URL(link.href, window.location.href);
      if (url.origin !== window.location.origin) return;
      // A link to a place on this same page is not leaving it.
      if (url.pathname === window.location.pathname && url.search === window.location.search) return;
      if (!window.confirm(message)) {
        event.preventDefault();
        event.stopPropagation();
      }
    };
    // Back: the guard entry is popped first; staying puts it back, leaving goes on back.
    if (!(window.history.state as Record<string, unknown> | null)?.[GUARD]) {
      window.history.pushState({ ...(window.history.state as object | null), [GUARD]: true }, "", window.location.href);
    }
    const popState = (event: PopStateEvent) => {
      if ((event.state as Record<string, unknown> | null)?.[GUARD]) return;
      if (!dirtyRef.current) return;
      if (window.confirm(message)) {
        dirtyRef.current = false;
        window.history.back();
      } else {
        window.history.pushState(
          { ...(window.history.state as object | null), [GUARD]: true },
          "",
          window.location.href,
        );
      }
    };
    window.addEventListener("beforeunload", beforeUnload);
    document.addEventListener("click", click, true);
    window.addEventListener("popstate", popState);
    return () => {
      window.removeEventListener("beforeunload", beforeUnload);
      document.removeEventListener("click", click, true);
      window.removeEventListener("popstate", popState);
    };
  }, [dirty, message]);
}
