import type { Metadata } from "next";
import Link from "next/link";
import { CLINICAL_CAUTION } from "@/lib/report";
import "./globals.css";

export const metadata: Metadata = {
  title: "cpet-desk",
  description: "Cardiopulmonary exercise test analysis and report drafting (decision support)",
};

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
