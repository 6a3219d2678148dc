/**
 * The host names this installation answers to: localhost, 127.0.0.1 and ::1, the `HOST` it was started on (when that is
 * a name or an address, not "listen on all"), and any names in `CPET_ALLOWED_HOSTS` (comma-separated). A request whose
 * Host header names anything else is refused by `proxy.ts` (421), so a web page that points a name of its own at this
 * machine (DNS rebinding) cannot read or change data, with or without log-in.
 */
export function allowedHostNames(env: Record<string, string | undefined>): Set<string> {
  const names = new Set(["localhost", "127.0.0.1", "[::1]"]);
  const host = env.HOST?.trim().toLowerCase();
  if (host && host !== "0.0.0.0" && host !== "::" && host !== "[::]")
    names.add(host.includes(":") && !host.startsWith("[") ? `[${host}]` : host);
  for (const n of (env.CPET_ALLOWED_HOSTS ?? "").split(",")) if (n.trim()) names.add(n.trim().toLowerCase());
  return names;
}

/** The host name of a Host header, lower case and without the port ("[::1]" keeps its brackets); null when malformed. */
export function hostNameOf(hostHeader: string | null): string | null {
  if (!hostHeader) return null;
  const h = hostHeader.trim().toLowerCase();
  const m = /^(\[[0-9a-f:.]+\]|[a-z0-9.-]+)(?::\d{1,5})?$/.exec(h);
  return m ? m[1] : null;
}

export function hostAllowed(hostHeader: string | null, env: Record<string, string | undefined>): boolean {
  const name = hostNameOf(hostHeader);
  return name !== null && allowedHostNames(env).has(name);
}

/**
 * Whether a request is a write sent from another site's page: a method other than GET/HEAD/OPTIONS whose Origin header
 * is present and names another host than the one the request was sent to (`x-forwarded-host` when a reverse proxy set
 * it, else Host). Browsers send Origin on every cross-site POST, so a forged form on another site is refused here with a
 * plain 403 (before, the server-action origin check answered 500). "Origin: null" (a sandboxed or file page) counts as
 * another site. Requests without Origin (the CLI, curl) are left to the access checks.
 */
export function crossSiteWrite(
  method: string,
  originHeader: string | null,
  hostHeader: string | null,
  forwardedHostHeader: string | null = null,
): boolean {
  if (["GET", "HEAD", "OPTIONS"].includes(method.toUpperCase())) return false;
  if (originHeader === null) return false;
  let originHost: string;
  try {
    originHost = new URL(originHeader).host.toLowerCase();
  } catch {
    return true; // "null" or garbage: not this site
  }
  const target = (forwardedHostHeader?.split(",")[0] ?? hostHeader ?? "").trim().toLowerCase();
  return originHost === "" || originHost !== target;
}
