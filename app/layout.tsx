import type { Metadata } from "next";
import Link from "next/link";
import { CLINICAL_CAUTION } from "@/lib/report";
import { currentAccess } from "./access";
import { auditTrailWarning } from "./auditTrailWarning";
import { logOutAction } from "./login/actions";
import "./globals.css";

export const metadata: Metadata = {
  title: "cpet-desk",
  description: "Cardiopulmonary exercise test analysis and report drafting (decision support)",
};

/** Who is signed in (with a way out), or that the installation runs without log-in. */
async function AccountBar() {
  const access = await currentAccess();
  if (!access) return null;
  if (access.mode === "open")
    return (
      <span className="account-bar how" data-testid="account-bar">
        No log-in on this installation
      </span>
    );
  return (
    <form action={logOutAction} className="account-bar" data-testid="account-bar">
      <span>
        {access.account.displayName} ({access.account.role})
      </span>{" "}
      <button type="submit" data-testid="log-out">
        Sign out
      </button>
    </form>
  );
}

/**
 * A warning on every page when the audit trail cannot be trusted (`auditTrailWarning`); not shown to someone who has
 * not signed in. The first page drawn after start-up checks the whole hash chain, later ones only what was added.
 */
async function AuditTrailBanner() {
  const access = await currentAccess();
  if (!access) return null;
  const words = auditTrailWarning();
  if (words.length === 0) return null;
  return (
    <div className="panel sev-error" role="alert" data-testid="audit-trail-warning">
      {words.map((w) => (
        <p key={w}>
          <strong>{w}</strong>
        </p>
      ))}
    </div>
  );
}

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <body>
        <header className="masthead">
          <Link href="/" className="brand">
            cpet-desk
          </Link>
          <nav>
            <Link href="/">Test register</Link>
            <Link href="/compare">Compare tests</Link>
            <Link href="/equations">Reference equations</Link>
            <Link href="/profiles">Mapping profiles</Link>
            <Link href="/lab">Lab settings</Link>
          </nav>
          <AccountBar />
        </header>
        <AuditTrailBanner />
        <p className="caution" role="note" data-testid="clinical-caution">
          {CLINICAL_CAUTION}
        </p>
        <main>{children}</main>
        <footer className="colophon">
          cpet-desk · decision support for qualified clinicians · results are drafts until signed
        </footer>
      </body>
    </html>
  );
}
