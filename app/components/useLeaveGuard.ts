"use client";

import { useEffect } from "react";

/**
 * While `dirty`, ask before the page is left: on reload or close (the browser's own question) and on an in-app link
 * (`warningFor` gives the question for that link, e.g. a different one for a PDF download).
 */
export function useLeaveGuard(dirty: boolean, warning: string, warningFor?: (url: URL) => string): void {
  useEffect(() => {
    if (!dirty) return;
    const beforeUnload = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = warning;
      return warning;
    };
    const onClick = (e: MouseEvent) => {
      const a = (e.target as Element | null)?.closest?.("a[href]") as HTMLAnchorElement | null;
      if (!a || a.target === "_blank" || e.defaultPrevented) return;
      const url = new URL(a.href, window.location.href);
      if (url.origin !== window.location.origin) return;
      if (!window.confirm(warningFor ? warningFor(url) : warning)) {
        e.preventDefault();
        e.stopPropagation();
      }
    };
    window.addEventListener("beforeunload", beforeUnload);
    document.addEventListener("click", onClick, true);
    return () => {
      window.removeEventListener("beforeunload", beforeUnload);
      document.removeEventListener("click", onClick, true);
    };
  }, [dirty, warning, warningFor]);
}
