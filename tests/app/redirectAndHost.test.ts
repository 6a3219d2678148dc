/**
 * Where a log-in may send the browser back to, and which Host names the app answers to (DNS rebinding). The hostile
 * values are the ones a security review tried (INVENTED host names); browsers drop tabs and newlines from URLs (WHATWG URL
 * standard, secondary), which is why "/<TAB>/host" must not pass.
 */
import { describe, expect, it } from "vitest";
import { safeNext } from "../../app/access";
import { allowedHostNames, hostAllowed, hostNameOf } from "../../app/allowedHost";

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
