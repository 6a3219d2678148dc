import fs from "node:fs";
import path from "node:path";
import type { Command } from "commander";
import { analyse, buildRecord } from "../lib/analysis";
import { hasErrors } from "../lib/core";
import { toCliJson } from "../lib/report";

export function registerAnalyse(program: Command): void {
  program
    .command("analyse")
    .alias("analyze")
    .description("Analyse one exercise-test file and print the results")
    .argument("<file>", "breath-by-breath or stage file (CSV, TSV, semicolon, XLSX)")
    .option("--json", "print one JSON object on stdout (documented by cli/analyse.schema.json)")
    .option("--sex <sex>", "male | female")
    .option("--age <years>", "age in years", parseNumber("--age"))
    .option("--height-cm <cm>", "height in cm", parseNumber("--height-cm"))
    .option("--weight-kg <kg>", "body weight in kg", parseNumber("--weight-kg"))
    .option("--ergometer <kind>", "cycle | treadmill", "cycle")
    .action(async (file: string, opts: AnalyseOptions) => {
      const result = await runAnalyse(file, opts);
      process.stdout.write(opts.json ? JSON.stringify(result, null, 2) + "\n" : formatText(result));
    });
}

interface AnalyseOptions {
  json?: boolean;
  sex?: string;
  age?: number;
  heightCm?: number;
  weightKg?: number;
  ergometer: string;
}

function parseNumber(flag: string) {
  return (raw: string): number => {
    const n = Number(raw);
    if (!Number.isFinite(n)) throw new Error(`${flag} needs a number, got "${raw}"`);
    return n;
  };
}

export async function runAnalyse(file: string, opts: AnalyseOptions) {
  if (opts.sex && opts.sex !== "male" && opts.sex !== "female")
    throw new Error(`--sex must be male or female, got "${opts.sex}"`);
  if (opts.ergometer !== "cycle" && opts.ergometer !== "treadmill")
    throw new Error(`--ergometer must be cycle or treadmill, got "${opts.ergometer}"`);
  let bytes: Uint8Array;
  try {
    bytes = new Uint8Array(fs.readFileSync(file));
  } catch {
    throw new Error(`cannot read ${file}: no such file or not readable`);
  }
  const built = await buildRecord({
    bytes,
    fileName: path.basename(file),
    patient: { sex: opts.sex as "male" | "female" | undefined, ageY: opts.age, heightCm: opts.heightCm, weightKg: opts.weightKg },
    ergometer: opts.ergometer,
  });
  if (!built.record || hasErrors(built.issues)) {
    const what = built.issues.filter((i) => i.severity === "error").map((i) => i.message);
    throw new Error(`${path.basename(file)} cannot be used: ${what.join(" ") || "unknown problem"}`);
  }
  return toCliJson(analyse(built.record));
}

function formatText(r: Awaited<ReturnType<typeof runAnalyse>>): string {
  const lines = [
    `peak VO2: ${r.peak.vo2MlMin?.toFixed(0) ?? "not determinable"} mL/min (${r.peak.method})`,
    `duration: ${r.durationS?.toFixed(0) ?? "—"} s`,
    ...r.issues.map((i) => `${i.severity}: ${i.message}`),
    "Decision support only: results must be reviewed by a qualified clinician.",
  ];
  return lines.join("\n") + "\n";
}
