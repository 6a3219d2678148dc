import fs from "node:fs";
import path from "node:path";
import type { Command } from "commander";
import { analyse, buildRecord, type ReferralQuestion } from "../lib/analysis";
import { importLactateFile, parseSignedTimeText, STAGE_DURATION_LIMITS_S } from "../lib/breath";
import { hasErrors, makeIssue, plausibilityProblem, type PlausibleField } from "../lib/core";
import { ATRIAL_FIBRILLATION_HR_NOTE, BETA_BLOCKER_HR_NOTE, REFERRAL_QUESTIONS } from "../lib/interpret";
import { CLINICAL_CAUTION, toCliJson, type CliAnalysisJson } from "../lib/report";
import { conditionTable, exerciseShareSetAside } from "../lib/signal";
import { formatClock } from "../lib/units";
import { EXIT_STATUS_HELP, UsageError } from "./usageError";

/** A span on the file's clock, s. */
type Span = { startS: number; endS: number };

interface AnalyseOptions {
  json?: boolean;
  sex?: string;
  age?: number;
  heightCm?: number;
  weightKg?: number;
  betaBlocker?: boolean;
  atrialFibrillation?: boolean;
  ergometer: string;
  fev1L?: number;
  mvvLMin?: number;
  lactate?: string;
  lactateTimeUnit?: "s" | "min";
  lactateUnit?: "mmol/L" | "mg/dL";
  stageDurationS?: number;
  referral: string;
  select: Record<string, string>;
  exerciseSpan?: Span;
  /** Spans of the record whose gas values are set aside by hand (a leak, a run of coughs), each m:ss-m:ss. */
  setAside?: Span[];
  /** Spans whose heart rate is set aside by hand (an ECG artefact). */
  setAsideHr?: Span[];
}

export function registerAnalyse(program: Command): void {
  program
    .command("analyse")
    .alias("analyze")
    .description("Analyse one exercise-test file and print the results")
    .argument("<file>", "breath-by-breath or stage file (CSV, TSV, semicolon, XLSX)")
    .option("--json", "print one JSON object on stdout (documented by cli/analyse.schema.json)")
    .option("--sex <sex>", "male | female")
    .option("--age <years>", "age in years", parseNumber("--age", "ageY"))
    .option("--height-cm <cm>", "height in cm", parseNumber("--height-cm", "heightCm"))
    .option("--weight-kg <kg>", "body weight in kg", parseNumber("--weight-kg", "weightKg"))
    .option("--beta-blocker", "the patient takes a beta-blocker (heart-rate criteria and cut-offs read accordingly)")
    .option(
      "--atrial-fibrillation",
      "atrial fibrillation or another irregular rhythm during the test (heart-rate criteria, heart-rate indices and O2 pulse are not interpreted)",
    )
    .option("--ergometer <kind>", "cycle | treadmill", "cycle")
    .option(
      "--fev1-l <litres>",
      "resting FEV1 in litres (breathing reserve from FEV1 × 40 unless MVV is given)",
      parseNumber("--fev1-l", "fev1L"),
    )
    .option("--mvv-l-min <L/min>", "measured maximal voluntary ventilation, L/min", parseNumber("--mvv-l-min", "mvvLMin"))
    .option(
      "--stage-duration-s <s>",
      "length of each stage, s, for a stage table without a time column (default 60)",
      parseStageSeconds,
    )
    .option("--lactate <file>", "blood lactate samples (CSV/XLSX with time or stage, optional work/speed, and lactate)")
    .option(
      "--lactate-time-unit <unit>",
      "s | min: unit of the lactate file's plain-number times when its header names none (default s)",
      parseLactateTimeUnit,
    )
    .option(
      "--lactate-unit <unit>",
      "mmol/L | mg/dL: unit of the lactate values when the file's header names none (default: mmol/L, or mg/dL when the values' magnitude says so)",
      parseLactateUnit,
    )
    .option(
      "--select <column=value>",
      "in a file holding several tests, keep the rows where column = value (repeatable)",
      collectSelect,
      {},
    )
    .option("--referral <question>", `referral question: ${REFERRAL_QUESTIONS.join(" | ")}`, "general")
    .option(
      "--exercise-span <start-end>",
      "the incremental exercise phase set by hand, m:ss-m:ss or seconds (e.g. 6:00-16:30), instead of the detected one",
      parseExerciseSpan,
    )
    .option(
      "--set-aside <start-end>",
      "a span of the record whose gas and ventilation values are not used (a leak, a run of coughs), m:ss-m:ss or seconds; repeatable",
      collectSetAside,
      [],
    )
    .option(
      "--set-aside-hr <start-end>",
      "a span of the record whose heart rate is not used (an ECG artefact), m:ss-m:ss or seconds; repeatable",
      collectSetAsideHr,
      [],
    )
    .addHelpText("after", EXIT_STATUS_HELP)
    .action(async (file: string, opts: AnalyseOptions) => {
      const result = await runAnalyse(file, opts);
      process.stdout.write(opts.json ? JSON.stringify(result, null, 2) + "\n" : formatText(result, opts));
    });
}

/** A numeric option, refused unless it lies within the plausibility limits shared with the upload form. */
function parseNumber(flag: string, field: PlausibleField) {
  return (raw: string): number => {
    const n = Number(raw);
    if (raw.trim() === "" || !Number.isFinite(n)) throw new UsageError(`${flag} needs a number, got "${raw}"`);
    const problem = plausibilityProblem(field, n);
    if (problem) throw new UsageError(`${flag}: ${problem}`);
    return n;
  };
}

function parseLactateTimeUnit(raw: string): "s" | "min" {
  const u = raw.trim().toLowerCase();
  if (u === "s" || u === "min") return u;
  throw new UsageError(`--lactate-time-unit must be s or min, got "${raw}"`);
}

function parseLactateUnit(raw: string): "mmol/L" | "mg/dL" {
  const u = raw.trim().toLowerCase();
  if (u === "mmol/l") return "mmol/L";
  if (u === "mg/dl") return "mg/dL";
  throw new UsageError(`--lactate-unit must be mmol/L or mg/dL, got "${raw}"`);
}

function parseStageSeconds(raw: string): number {
  const n = Number(raw);
  const { min, max } = STAGE_DURATION_LIMITS_S;
  if (raw.trim() === "" || !Number.isFinite(n) || n < min || n > max)
    throw new UsageError(`--stage-duration-s must be a number of seconds between ${min} and ${max}, got "${raw}"`);
  return n;
}

/** "6:00-16:30", "360-990" or "-2:00--1:00" (before 0:00): start and end of a span on the file's clock, s. */
function parseSpan(flag: string, raw: string): Span {
  const m = /^\s*(-?[^-\s]+)\s*-\s*(-?[^-\s]+)\s*$/.exec(raw);
  const [startS, endS] = m ? [parseSignedTimeText(m[1]), parseSignedTimeText(m[2])] : [NaN, NaN];
  if (!Number.isFinite(startS) || !Number.isFinite(endS) || !(endS > startS))
    throw new UsageError(`${flag} needs start-end as m:ss-m:ss or seconds with the end after the start, got "${raw}"`);
  return { startS, endS };
}

function parseExerciseSpan(raw: string): Span {
  return parseSpan("--exercise-span", raw);
}

function collectSetAside(raw: string, acc: Span[]): Span[] {
  return [...acc, parseSpan("--set-aside", raw)];
}

function collectSetAsideHr(raw: string, acc: Span[]): Span[] {
  return [...acc, parseSpan("--set-aside-hr", raw)];
}

function collectSelect(raw: string, acc: Record<string, string>): Record<string, string> {
  const at = raw.indexOf("=");
  if (at <= 0) throw new UsageError(`--select needs column=value, got "${raw}"`);
  return { ...acc, [raw.slice(0, at).trim()]: raw.slice(at + 1).trim() };
}

function readBytes(file: string): Uint8Array {
  let stat: fs.Stats;
  try {
    stat = fs.statSync(file);
  } catch {
    throw new Error(`cannot read ${file}: no such file`);
  }
  if (stat.isDirectory()) throw new Error(`cannot read ${file}: it is a folder; give one exported file`);
  try {
    return new Uint8Array(fs.readFileSync(file));
  } catch {
    throw new Error(`cannot read ${file}: not readable (check its permissions)`);
  }
}

export async function runAnalyse(file: string, opts: AnalyseOptions): Promise<CliAnalysisJson> {
  if (opts.sex && opts.sex !== "male" && opts.sex !== "female")
    throw new UsageError(`--sex must be male or female, got "${opts.sex}"`);
  if (opts.ergometer !== "cycle" && opts.ergometer !== "treadmill")
    throw new UsageError(`--ergometer must be cycle or treadmill, got "${opts.ergometer}"`);
  if (!REFERRAL_QUESTIONS.includes(opts.referral as ReferralQuestion))
    throw new UsageError(`--referral must be one of ${REFERRAL_QUESTIONS.join(", ")}`);
  const bytes = readBytes(file);
  const built = await buildRecord({
    bytes,
    fileName: path.basename(file),
    patient: {
      sex: opts.sex as "male" | "female" | undefined,
      ageY: opts.age,
      heightCm: opts.heightCm,
      weightKg: opts.weightKg,
      ...(opts.betaBlocker ? { betaBlocker: true } : {}),
      ...(opts.atrialFibrillation ? { atrialFibrillation: true } : {}),
    },
    ergometer: opts.ergometer,
    referral: opts.referral as ReferralQuestion,
    importOptions: {
      weightKg: opts.weightKg,
      ...(Object.keys(opts.select ?? {}).length > 0 ? { select: opts.select } : {}),
      ...(opts.stageDurationS !== undefined ? { stageDurationS: opts.stageDurationS } : {}),
    },
  });
  if (!built.record || hasErrors(built.issues)) {
    const what = built.issues.filter((i) => i.severity === "error").map((i) => i.message);
    throw new Error(`${path.basename(file)} cannot be used: ${what.join(" ") || "unknown problem"}`);
  }
  const record = built.record;
  if (opts.fev1L !== undefined || opts.mvvLMin !== undefined) record.spirometry = { fev1L: opts.fev1L, mvvLMin: opts.mvvLMin };
  if (opts.lactate) {
    const lac = await importLactateFile(readBytes(opts.lactate), {
      ...(opts.lactateTimeUnit ? { timeUnit: opts.lactateTimeUnit } : {}),
      ...(opts.lactateUnit ? { lactateUnit: opts.lactateUnit } : {}),
    });
    if (lac.samples.length === 0) {
      throw new Error(
        `${path.basename(opts.lactate)} has no usable lactate samples: ${lac.issues.map((i) => i.message).join(" ")}`,
      );
    }
    if (record.table.rows.some((row) => row.lactateMmolL !== undefined))
      lac.issues.push(
        makeIssue(
          "info",
          "lactate-file-replaces-column",
          `The lactate samples of ${path.basename(opts.lactate)} are used instead of the lactate column of ${path.basename(file)}.`,
        ),
      );
    record.lactate = lac.samples;
    record.importIssues = [...record.importIssues, ...lac.issues];
  }
  // a span outside the record is a mistake in the command, not a clinical data problem: refused, like other options
  const rows = record.table.rows;
  const first = rows[0].timeS;
  const last = rows[rows.length - 1].timeS;
  const spans: [string, Span][] = [
    ...(opts.exerciseSpan ? [["--exercise-span", opts.exerciseSpan] as [string, Span]] : []),
    ...(opts.setAside ?? []).map((s): [string, Span] => ["--set-aside", s]),
    ...(opts.setAsideHr ?? []).map((s): [string, Span] => ["--set-aside-hr", s]),
  ];
  for (const [flag, { startS, endS }] of spans)
    if (startS < first || endS > last) {
      const relative = record.importIssues.some((i) => i.code === "time-made-relative")
        ? " The file's clock times of day were counted from its first row, so give the span from there."
        : "";
      throw new UsageError(
        `${flag} ${formatClock(startS)}-${formatClock(endS)} does not lie inside the record (${formatClock(first)}-${formatClock(last)}).${relative}`,
      );
    }
  // a span over most of the exercise phase is not a fault to set aside but a test to repeat: refused, as on the page
  if (opts.setAside?.length) {
    const ex = conditionTable(
      record.table,
      opts.exerciseSpan ? { phases: { exerciseSpan: { ...opts.exerciseSpan, reason: "" } } } : {},
    ).exercise;
    if (ex && exerciseShareSetAside(opts.setAside, ex) > 0.5)
      throw new UsageError(
        `--set-aside ${opts.setAside.map((x) => `${formatClock(x.startS)}-${formatClock(x.endS)}`).join(", ")} would set aside more than half of the exercise phase (${formatClock(ex.startS)}-${formatClock(ex.endS)}): a recording that faulty should be repeated or re-imported.`,
      );
  }
  const settings = {
    conditioning: {
      ...(opts.exerciseSpan ? { phases: { exerciseSpan: { ...opts.exerciseSpan, reason: "set with --exercise-span" } } } : {}),
      ...(opts.setAside?.length || opts.setAsideHr?.length
        ? {
            setAside: [
              ...(opts.setAside ?? []).map((s) => ({ ...s, reason: "set with --set-aside" })),
              ...(opts.setAsideHr ?? []).map((s) => ({
                ...s,
                reason: "set with --set-aside-hr",
                channel: "heart-rate" as const,
              })),
            ],
          }
        : {}),
    },
  };
  return toCliJson(analyse(record, settings), CLINICAL_CAUTION);
}

/** How MVV was obtained, for the text summary: an estimate says so, as the report does. */
const MVV_METHOD_WORDS: Record<string, string> = {
  measured: "MVV measured",
  fev1x40: "MVV estimated as FEV1 × 40; × 35 would give less reserve",
  fev1x35: "MVV estimated as FEV1 × 35",
};

export function formatText(r: CliAnalysisJson, opts: Pick<AnalyseOptions, "betaBlocker" | "atrialFibrillation"> = {}): string {
  // the same words beside heart rate as on the page and in the report
  const hrNote = opts.atrialFibrillation
    ? ` (${ATRIAL_FIBRILLATION_HR_NOTE})`
    : opts.betaBlocker
      ? ` (${BETA_BLOCKER_HR_NOTE})`
      : "";
  // a value with its unit, or "not determinable" without one
  const n = (x: number | null, d = 0, unit = "") => (x === null ? "not determinable" : `${x.toFixed(d)}${unit}`);
  // a calibrated band after its value ("band" means what the JSON Schema says), or nothing
  const b = (band: { low: number; high: number } | null, d = 0) =>
    band ? `, band ${band.low.toFixed(d)}-${band.high.toFixed(d)}` : "";
  // % of the lab's predicted value, with the equation, where one was computed
  const pct = (q: string) => {
    const p = r.predicted[q];
    if (!p || p.percentPredicted === null) return "";
    // why it is not read, unless the heart-rate note beside it says so already
    const why = p.notRead && !hrNote.includes(p.notRead) ? `; not read: ${p.notRead}` : "";
    return `, ${p.percentPredicted.toFixed(0)} % predicted (${p.equationId}${why})`;
  };
  const perKg =
    r.peak.vo2MlKgMin !== null
      ? n(r.peak.vo2MlKgMin, 1, " mL/kg/min")
      : r.peak.vo2MlMin === null
        ? "per kg not determinable"
        : "per kg not determinable (give --weight-kg)";
  const onTreadmill = r.peak.workW === null && r.peak.speedKmh != null;
  const effortWords = r.interpretation as {
    effort?: { text?: string; verdict?: string; label?: string };
    path?: { end?: { label: string } | null; steps?: { title: string; borderline?: string }[] };
    lead?: string[];
    patterns?: { statement: string; support: string; borderline?: string }[];
  };
  const leading = effortWords.patterns?.find((p) => p.support === "strong" || p.support === "moderate");
  const lines = [
    `peak VO2        ${n(r.peak.vo2MlMin, 0, " mL/min")}, ${perKg}${pct("vo2PeakMlMin")} (${r.peak.method})`,
    `peak RER ${n(r.peak.rer, 2)}, HR ${n(r.peak.hrBpm, 0, " bpm")}${pct("hrMaxBpm")}${hrNote}, ${
      onTreadmill
        ? `speed ${n(r.peak.speedKmh ?? null, 1, " km/h")}${r.peak.gradePct != null ? `, grade ${n(r.peak.gradePct, 1, " %")}` : ""}`
        : `work rate ${n(r.peak.workW, 0, " W")}`
    }`,
    `VT1             ${n(r.vt1.vo2MlMin, 0, " mL/min")} (confidence ${r.vt1.confidence})`,
    `VT2             ${n(r.vt2.vo2MlMin, 0, " mL/min")} (confidence ${r.vt2.confidence})`,
    `VE/VCO2 slope   ${n(r.veVco2Slope.toRcp, 1)} (${r.veVco2Slope.toRcpFittedTo.replace(/^VE\/VCO2 slope,? /, "")}${b(r.veVco2Slope.toRcpBand, 1)}); ${n(r.veVco2Slope.whole, 1)} (whole exercise, ${r.averaging.startsWith("breath by breath") ? "breath by breath" : "on the rows as exported"}${b(r.veVco2Slope.wholeBand, 1)})`,
    `OUES            ${n(r.oues)}${r.ouesBand ? ` (${b(r.ouesBand).slice(2)})` : ""}`,
    `ΔVO2/ΔWR        ${onTreadmill && r.dVo2dWr === null ? "not applicable (no work rate: treadmill)" : `${n(r.dVo2dWr, 1, " mL/min/W")}${r.dVo2dWrBand ? ` (${b(r.dVo2dWrBand, 1).slice(2)})` : ""}`}`,
    `breathing reserve ${r.breathingReserve.pct === null ? "not determinable (give --mvv-l-min or --fev1-l)" : `${n(r.breathingReserve.pct, 0, " %")}, VE/MVV ${n(r.breathingReserve.veMvvPct, 0, " %")} (${MVV_METHOD_WORDS[r.breathingReserve.mvvMethod ?? ""] ?? "MVV"})`}`,
    // the verdict in words ("Peak RER below the maximal-effort cut-off, but a physiological limit was reached: …")
    ...(effortWords.effort?.verdict ? [`effort          ${effortWords.effort.label ?? effortWords.effort.verdict}`] : []),
    ...(effortWords.path?.end
      ? [
          `draft reading   ${(effortWords.lead ?? [`${effortWords.path.end.label}.`]).join(" ")}${leading ? ` ${leading.statement}${leading.borderline ? ` Read with: ${leading.borderline}.` : ""}` : ""}`,
        ]
      : []),
    // a step an uncertainty band would turn (an MVV estimated from FEV1, a threshold's band), as the draft says it
    ...(effortWords.path?.steps ?? []).filter((s) => s.borderline).map((s) => `borderline      ${s.title}: ${s.borderline}`),
    ...(r.lactate ? lactateLines(r.lactate) : []),
    ...r.issues.filter((i) => i.severity !== "info").map((i) => `${i.severity}: ${i.message}`),
    // why a value above is missing (predicted values say so in the warnings already; OBLA given as a speed is not missing)
    ...r.issues
      .filter(
        (i) =>
          i.code === "not-determinable" &&
          !i.where?.field?.startsWith("predicted.") &&
          !(i.where?.field === "lactate.obla4.workW" && r.lactate?.axis !== "workW"),
      )
      .map((i) => `not determinable: ${i.message}`),
    r.caution,
  ];
  return lines.join("\n") + "\n";
}

/** The lactate lines of the text summary: OBLA on the axis the samples were placed by, then every method by name. */
function lactateLines(l: NonNullable<CliAnalysisJson["lactate"]>): string[] {
  const onSpeed = l.axis === "speedKmh";
  const v = (x: number | null) => (x === null ? "not determinable" : onSpeed ? `${x.toFixed(1)} km/h` : `${x.toFixed(0)} W`);
  const obla = onSpeed ? l.obla4.speedKmh : l.obla4.workW;
  // heart rate where read, and a mark on a value read across a suspect sample (the warning names it)
  const extra = (t: (typeof l.thresholds)[number] | undefined) =>
    t && t.value !== null
      ? `${t.hrBpm !== null ? ` (heart rate ${t.hrBpm.toFixed(0)} bpm)` : ""}${t.caution ? " [caution: suspect sample, see warnings]" : ""}`
      : "";
  const oblaT = l.thresholds.find((t) => t.method === "obla-4");
  const others = l.thresholds.filter((t) => t.method !== "obla-4").map((t) => `${t.name} ${v(t.value)}${extra(t)}`);
  const peak = l.peakMmolL !== null ? `; peak lactate ${l.peakMmolL.toFixed(1)} mmol/L` : "";
  const recovery = l.recoverySamples.length
    ? ` (${l.recoverySamples.length} recovery sample(s): peak lactate only, not on the curve)`
    : "";
  return [
    `lactate 4 mmol/L ${v(obla)}${extra(oblaT)}${onSpeed ? " (samples placed by speed: the file gives no work rate)" : ""}`,
    `lactate         ${others.join("; ")}${peak}${recovery}`,
  ];
}
