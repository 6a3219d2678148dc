/**
 * Every way into the app's data asks who is acting (app/access.ts): each page, each download or API route and each
 * server action calls one of the access checks before it reads or writes anything. A new page or action without one
 * fails here. The log-in page and its actions, and the health check, are the only ones open to everyone.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

const APP = path.join(__dirname, "..", "..", "app");
const OPEN = new Set(["login/page.tsx", "login/actions.ts", "api/health/route.ts"]);
const CHECK = /\b(pageAccess|actionAccess|currentAccess|routeAccess)\(/;

function files(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? files(p) : [p];
  });
}

const rel = (p: string) => path.relative(APP, p).split(path.sep).join("/");
const all = files(APP);

/** The body of each exported async function of a file, by name (up to the next top-level declaration). */
function exportedFunctions(source: string): { name: string; body: string }[] {
  const starts = [...source.matchAll(/^export (?:async )?function (\w+)/gm)];
  return starts.map((m) => {
    const end = source.slice(m.index! + 1).search(/^(export |function |const |async function |interface |type )/m);
    return { name: m[1], body: end < 0 ? source.slice(m.index!) : source.slice(m.index!, m.index! + 1 + end) };
  });
}

describe("access checks", () => {
  const pages = all.filter((p) => /(^|\/)page\.tsx$/.test(rel(p)) && !OPEN.has(rel(p)));
  const routes = all.filter((p) => /(^|\/)route\.ts$/.test(rel(p)) && !OPEN.has(rel(p)));
  const actions = all.filter((p) => fs.readFileSync(p, "utf8").startsWith('"use server"') && !OPEN.has(rel(p)));

  it("finds the app's pages, routes and server actions", () => {
    expect(pages.length).toBeGreaterThanOrEqual(10);
    expect(routes.length).toBeGreaterThanOrEqual(3);
    expect(actions.length).toBeGreaterThanOrEqual(8);
  });

  it("checks access in every page and route", () => {
    const missing = [...pages, ...routes].filter((p) => !CHECK.test(fs.readFileSync(p, "utf8"))).map(rel);
    expect(missing).toEqual([]);
  });

  it("checks access in every exported server action, before it does anything else", () => {
    const missing: string[] = [];
    for (const file of actions) {
      const fns = exportedFunctions(fs.readFileSync(file, "utf8"));
      expect(fns.length, rel(file)).toBeGreaterThan(0);
      for (const fn of fns) {
        // the body after the function's own signature line
        const body = fn.body.slice(fn.body.indexOf("\n"));
        const called = body.search(CHECK);
        // nothing that reads or writes data may come before the check: no store call, no analysis, no file read
        const firstEffect = body.search(
          /\b(get\w+|save\w+|update\w+|replace\w+|delete\w+|rename\w+|analyse|importBreathFile|addSampleFile|make\w+|sign\w+)\(/,
        );
        if (called < 0 || (firstEffect >= 0 && firstEffect < called)) missing.push(`${rel(file)}: ${fn.name}`);
      }
    }
    expect(missing).toEqual([]);
  });
});
