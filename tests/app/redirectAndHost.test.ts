/**
 * Where a log-in may send the browser back to, and which Host names the app answers to (DNS rebinding). The hostile
 * values are the ones a security review tried (INVENTED host names); browsers drop tabs and newlines from URLs (WHATWG URL
 * standard, secondary), which is why "/<TAB>/host" must not pass.
 */
import { describe, expect, it } from "vitest";
import { safeNext } from "../../app/access";
import { allowedHostNames, crossSiteWrite, hostAllowed, hostNameOf } from "../../app/allowedHost";

describe("safeNext", () => {
  it.each([
    ["/", "/"],
    ["/tests/12/report", "/tests/12/report"],
    ["/compare?a=1&b=2#x", "/compare?a=1&b=2#x"],
    ["/tests/../lab", "/lab"],
  ])("keeps a path of this app: %s → %s", (next, out) => expect(safeNext(next)).toBe(out));
  it.each([
    "//evil.example/phish",
    "/\\evil.example/phish",
    "/\t/evil.example/phish",
    "/\n/evil.example/phish",
    "/\r/evil.example/phish",
    "/%09/evil.example",
    "https://evil.example/",
    "javascript:alert(1)",
    "evil.example",
    "",
  ])("sends anything else to the register: %j", (next) => {
    const out = safeNext(next);
    expect(new URL(out, "http://app.invalid").origin).toBe("http://app.invalid");
    if (/[\t\n\r\\]/.test(next) || next.startsWith("//") || !next.startsWith("/")) expect(out).toBe("/");
  });
  it("refuses values that are not strings", () => {
    expect(safeNext(undefined)).toBe("/");
    expect(safeNext(["/lab"])).toBe("/");
  });
});

describe("allowed hosts", () => {
  it("answers to localhost, 127.0.0.1 and ::1 on any port, and to nothing else by default", () => {
    for (const h of ["localhost:3000", "127.0.0.1:3100", "[::1]:3000", "LOCALHOST", "127.0.0.1"])
      expect(hostAllowed(h, {})).toBe(true);
    for (const h of ["rebind.attacker.example:3000", "127.0.0.1.attacker.example", "evil.example", "", null, "127.0.0.1:3000/x"])
      expect(hostAllowed(h, {})).toBe(false);
  });
  it("adds the HOST it was started on (not 'all addresses') and the names in CPET_ALLOWED_HOSTS", () => {
    expect(hostAllowed("cpet.ward7.local:3000", { CPET_ALLOWED_HOSTS: "cpet.ward7.local, 10.0.0.5" })).toBe(true);
    expect(hostAllowed("10.0.0.5", { CPET_ALLOWED_HOSTS: "cpet.ward7.local, 10.0.0.5" })).toBe(true);
    expect(hostAllowed("192.168.1.20:3000", { HOST: "192.168.1.20" })).toBe(true);
    expect([...allowedHostNames({ HOST: "0.0.0.0" })].sort()).toEqual(["127.0.0.1", "[::1]", "localhost"]);
    expect(hostNameOf("[::1]:8080")).toBe("[::1]");
  });
});

describe("cross-site writes", () => {
  it("refuses a POST whose Origin names another host, or 'null', and lets same-site posts and reads through", () => {
    expect(crossSiteWrite("POST", "http://127.0.0.1:3000", "127.0.0.1:3000")).toBe(false);
    expect(crossSiteWrite("POST", "http://evil.example", "127.0.0.1:3000")).toBe(true);
    // another port on the same machine is another site's page (another app on 127.0.0.1)
    expect(crossSiteWrite("POST", "http://127.0.0.1:8080", "127.0.0.1:3000")).toBe(true);
    expect(crossSiteWrite("POST", "null", "127.0.0.1:3000")).toBe(true);
    expect(crossSiteWrite("DELETE", "http://evil.example", "localhost:3000")).toBe(true);
    // reads, and requests without Origin (CLI, curl), are left to the access checks
    expect(crossSiteWrite("GET", "http://evil.example", "127.0.0.1:3000")).toBe(false);
    expect(crossSiteWrite("POST", null, "127.0.0.1:3000")).toBe(false);
    // behind a reverse proxy the forwarded host is the one the browser saw
    expect(crossSiteWrite("POST", "https://cpet.lab.example", "127.0.0.1:3000", "cpet.lab.example")).toBe(false);
    expect(crossSiteWrite("POST", "HTTP://LOCALHOST:3000", "localhost:3000")).toBe(false);
  });
});
