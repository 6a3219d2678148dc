"use client";

import Link from "next/link";

/**
 * Shown inside the layout (so the clinical caution stays on screen) when a page fails on the server or in the browser:
 * plain words on what is kept and what to do, never a bare framework page. The error's digest lets the server log be
 * searched for the cause.
 */
export default function PageError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <section className="panel sev-error" data-testid="page-error" role="alert">
      <h1>This page could not be shown</h1>
      <p>
        Nothing saved is lost: uploaded files, analyses and saved report text are kept in the database. Text typed into a form and
        not yet saved may need to be entered again.
      </p>
      <p className="row">
        <button type="button" onClick={reset}>
          Try again
        </button>
        <Link href="/">Back to the test register</Link>
      </p>
      {error.digest ? <p className="how">Reference for the server log: {error.digest}</p> : null}
    </section>
  );
}
