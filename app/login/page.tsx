import Link from "next/link";
import { SESSION_HOURS, accountsEnabled } from "@/lib/store/accounts";
import { currentAccess, safeNext } from "../access";
import { LogInForm } from "./LogInForm";

export const dynamic = "force-dynamic";

/** Sign in (only when the installation has accounts; `cpet account add` makes them). */
export default async function LogInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const next = safeNext((await searchParams).next);
  if (!accountsEnabled())
    return (
      <>
        <h1>Sign in</h1>
        <p data-testid="no-accounts">
          This installation has no accounts, so nobody signs in: whoever can reach it uses it, and a report&apos;s signature
          carries the name the signer types. To require sign-in, make an account on the machine that holds the database with{" "}
          <code>npx cpet account add</code> (see DEVELOPERS.md). <Link href="/">Go to the test register</Link>.
        </p>
      </>
    );
  const access = await currentAccess();
  return (
    <>
      <h1>Sign in</h1>
      {access?.mode === "account" ? (
        <p data-testid="already-signed-in">
          You are signed in as {access.account.displayName} ({access.account.username}). <Link href={next}>Go on</Link>, or sign
          in as someone else below.
        </p>
      ) : null}
      <p className="how">
        Accounts are made on the machine that holds the database (<code>npx cpet account add</code>). A session lasts{" "}
        {SESSION_HOURS} hours; a clinician account can sign reports, a physiologist account can do everything else.
      </p>
      <LogInForm next={next} />
    </>
  );
}
