import path from "node:path";
import { ESLint } from "eslint";
import { describe, expect, it } from "vitest";

const root = path.resolve(__dirname, "../..");
const eslint = new ESLint({ cwd: root });

async function lint(file: string, code: string) {
  const [result] = await eslint.lintText(code, { filePath: path.join(root, file) });
  return result.messages.filter((m) => m.ruleId === "cpet/layers" || m.ruleId === "no-restricted-imports").map((m) => m.message);
}

describe("layering lint rule (eslint-rules/layers.mjs)", () => {
  it("fails when a lower layer imports a higher one", async () => {
    const msgs = await lint("lib/core/violation.ts", 'import { analyse } from "../analysis";\nexport const x = analyse;\n');
    expect(msgs.join(" ")).toMatch(/lib\/core may not import lib\/analysis/);
  });
  it("fails when lib imports React, Next or app/", async () => {
    expect((await lint("lib/thresholds/v.ts", 'import React from "react";\nexport const r = React;\n')).join(" ")).toMatch(
      /no React or Next/,
    );
    expect((await lint("lib/report/v.ts", 'import x from "next/link";\nexport const r = x;\n')).join(" ")).toMatch(
      /no React or Next/,
    );
    expect((await lint("lib/report/v.ts", 'import x from "../../app/page";\nexport const r = x;\n')).join(" ")).toMatch(
      /must not import app/,
    );
  });
  it("fails when pure lib code does I/O", async () => {
    expect((await lint("lib/signal/v.ts", 'import fs from "node:fs";\nexport const r = fs;\n')).join(" ")).toMatch(
      /lib\/ is pure/,
    );
  });
  it("allows downward imports", async () => {
    expect(
      await lint(
        "lib/thresholds/ok.ts",
        'import { makeIssue } from "../core";\nimport { conditionTable } from "../signal";\nexport const a = [makeIssue, conditionTable];\n',
      ),
    ).toEqual([]);
  });
});
