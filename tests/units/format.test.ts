import { describe, expect, it } from "vitest";
import { formatClock, formatUtcMinute } from "../../lib/units";

describe("display formats", () => {
  it("formatClock rounds the total seconds before splitting (754 s → 12:34, 59.6 s → 1:00, −30 s → -0:30)", () => {
    expect(formatClock(754)).toBe("12:34");
    expect(formatClock(59.6)).toBe("1:00");
    expect(formatClock(-30)).toBe("-0:30");
  });

  it("formatUtcMinute prints an ISO 8601 UTC time to the minute, as signatures and uploads are shown", () => {
    expect(formatUtcMinute("2026-12-05T01:40:59.999Z")).toBe("2026-12-05 01:40 UTC");
  });
});
