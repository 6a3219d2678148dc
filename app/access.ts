import "server-only";
import { cache } from "react";
import { cookies } from "next/headers";
import { redirect } from "next/navigation";
import { accountsEnabled, sessionAccount, type Account } from "@/lib/store/accounts";

/** The session cookie (httpOnly; its value is a random token whose SHA-256 is kept in `sessions`). */
export const SESSION_COOKIE = "cpet_session";

/**
 * Who is acting. `open`: the installation has no enabled account, so whoever reaches it acts as "local user" and a
 * signature carries a typed name. `account`: signed in; the user name is written to the audit trail.
 */
export type Access = { mode: "open"; actor: string } | { mode: "account"; actor: string; account: Account };

/**
 * Whether the session cookie gets the `secure` flag (sent back over HTTPS only). `npm start` serves plain HTTP, so the
 * app cannot see HTTPS itself; only a TLS proxy in front of it can say so, in `X-Forwarded-Proto`. That header is
 * trusted only when the installation says a proxy sets it (`CPET_TRUST_PROXY=1`): otherwise any client could send it.
 * The proxy must overwrite the header, not append to it; its first value is read. (`X-Forwarded-Proto` is a de-facto
 * header, common practice; RFC 7239's `Forwarded` is the standardised form and is not read here — recalled.)
 */
export function sessionCookieSecure(
  forwardedProto: string | null,
  env: Record<string, string | undefined> = process.env,
): boolean {
  if (env.CPET_TRUST_PROXY !== "1" || !forwardedProto) return false;
  return forwardedProto.split(",")[0].trim().toLowerCase() === "https";
}

/** Words for a request that needs a session and has none (pages redirect instead). */
export const SESSION_NEEDED =
  "Your session has ended or you are not signed in. Nothing was saved: keep this page open, sign in again in another tab, then repeat the step here.";

/**
 * The access of this request, or null when log-in is required and there is no valid session. Read once per page
 * request (React `cache`): the masthead's account bar, the audit-trail banner and the page each ask, and each reading
 * of a session also records its use.
 */
export const currentAccess = cache(async (): Promise<Access | null> => {
  // the cookie is read first: it marks the render as per-request, so a build never opens the database here
  const token = (await cookies()).get(SESSION_COOKIE)?.value;
  if (!accountsEnabled()) return { mode: "open", actor: "local user" };
  const account = sessionAccount(token);
  return account ? { mode: "account", actor: account.username, account } : null;
});

/**
 * A path inside the app to come back to after signing in; anything else goes to the register. Control characters and
 * backslashes are refused outright (a browser drops tabs and newlines from a URL, so "/<TAB>/host" would become
 * "//host"), and what is left must resolve to this app's own origin.
 */
export function safeNext(next: unknown): string {
  if (typeof next !== "string" || !next.startsWith("/") || /[\u0000-\u001f\u007f\\]/.test(next)) return "/";
  try {
    const base = "http://app.invalid";
    const url = new URL(next, base);
    return url.origin === base ? `${url.pathname}${url.search}${url.hash}` : "/";
  } catch {
    return "/";
  }
}

/** For a page: its access, or a redirect to the log-in page, which brings the user back to `path`. */
export async function pageAccess(path: string): Promise<Access> {
  const access = await currentAccess();
  if (!access) redirect(`/login?next=${encodeURIComponent(safeNext(path))}`);
  return access;
}

/**
 * For a form that has nothing typed to lose: its access, or a redirect to the log-in page. Forms that carry typed text
 * (the report) call `currentAccess` and answer `SESSION_NEEDED` instead, keeping the text on screen.
 */
export async function actionAccess(backTo = "/"): Promise<Access> {
  return pageAccess(backTo);
}

/** For a download or API route: its access, or a 401 response to send. */
export async function routeAccess(): Promise<Access | Response> {
  const access = await currentAccess();
  return access ?? new Response("Sign in to cpet-desk first.", { status: 401, headers: { "content-type": "text/plain" } });
}
