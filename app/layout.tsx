import type { Metadata } from "next";
import Link from "next/link";
import { CLINICAL_CAUTION } from "@/lib/report";
import { currentAccess } from "./access";
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
