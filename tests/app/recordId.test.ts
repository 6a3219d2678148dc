import { describe, expect, it } from "vitest";
import { recordId } from "../../app/schemas";
import { readSignForm } from "../../app/tests/[id]/report/schemas";

describe("recordId: ids in hand-made or damaged requests", () => {
  it("accepts a positive whole number as the page sends it (a string)", () => {
    expect(recordId("test").parse("12")).toBe(12);
  });

  it("answers every other value with one message a person can act on", () => {
    const message = "The request names no valid test (expected a positive whole number); reload the page";
    for (const sent of ["abc", "", "1.5", "-3", "0", "1e999"]) {
      const res = recordId("test").safeParse(sent);
      expect([sent, res.success]).toEqual([sent, false]);
      expect([sent, res.error?.issues.map((i) => i.message)]).toEqual([sent, [message]]);
    }
  });

  it("reaches the sign form's refusal in those words", () => {
    const form = new FormData();
    form.set("testId", "abc");
    form.set("reportId", "7");
    form.set("revision", "0");
    form.set("signer", "Dr A Example");
    form.set("attest", "on");
    form.set("title:conclusion", "Conclusion");
    form.set("section:conclusion", "Text (invented).");
    const { error } = readSignForm(form);
    expect(error?.issues.map((i) => [i.path.join("."), i.message])).toEqual([
      ["testId", "The request names no valid test (expected a positive whole number); reload the page"],
    ]);
  });
});
