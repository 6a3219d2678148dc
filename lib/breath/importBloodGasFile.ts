import { makeIssue, type Issue } from "../core";
import { readSimpleColumns } from "./readSimpleColumns";
import { readTableLayout } from "./readTableLayout";
import type { BloodGasSample } from "./types";

export interface BloodGasImportResult {
  samples: BloodGasSample[];
  issues: Issue[];
}

const BLOOD_GAS_COLUMNS = {
  time: ["time", "t", "zeit", "elapsed", "sampletime"],
  paO2: ["pao2", "po2", "arterialpo2", "pao2art"],
  paCO2: ["paco2", "pco2", "arterialpco2"],
} as const;

/** 1 kPa = 7.50062 mmHg (standard definition, common practice; same factor as lib/units). */
const MMHG_PER_KPA = 7.50062;

/**
 * Import arterial (or arterialised) blood gases: time (s, min or m:ss), PaO2, PaCO2 and an optional
 * label column ("rest", "peak"). Pressures in kPa are converted to mmHg; a column without a unit is
 * read as kPa when its median is below 30 (PaO2) or 12 (PaCO2), mmHg otherwise (common practice:
 * PaO2 ≈ 10–14 kPa = 75–105 mmHg, PaCO2 ≈ 4.5–6 kPa = 35–45 mmHg). Never rejects.
 */
export async function importBloodGasFile(bytes: Uint8Array): Promise<BloodGasImportResult> {
  const issues: Issue[] = [];
  const layout = await readTableLayout(bytes, issues);
  if (!layout) return { samples: [], issues };
  const cols = readSimpleColumns(layout, BLOOD_GAS_COLUMNS, ["label", "sample", "point", "condition", "site", "comment"], issues);
  if (!cols.values.paO2 && !cols.values.paCO2) {
    issues.push(
      makeIssue(
        "error",
        "no-blood-gas-column",
        "No PaO2 or PaCO2 column was found. Name them PaO2 and PaCO2 (with mmHg or kPa).",
      ),
    );
    return { samples: [], issues };
  }
  const factorOf = (key: "paO2" | "paCO2", kPaBelow: number): number => {
    const v = cols.values[key];
    if (!v) return 1;
    const unit = cols.units[key];
    if (unit === "kPa") return MMHG_PER_KPA;
    if (unit === "mmHg") return 1;
    const sorted = [...v].filter(Number.isFinite).sort((a, b) => a - b);
    const median = sorted[Math.floor(sorted.length / 2)];
    if (median < kPaBelow) {
      issues.push(
        makeIssue(
          "info",
          "unit-from-values",
          `${key === "paO2" ? "PaO2" : "PaCO2"} has no unit; values around ${median} look like kPa and were converted to mmHg.`,
          { column: cols.headers[key] },
        ),
      );
      return MMHG_PER_KPA;
    }
    return 1;
  };
  const fO2 = factorOf("paO2", 30);
  const fCO2 = factorOf("paCO2", 12);
  const timeUnit = cols.units.time;
  const tf = timeUnit === "min" ? 60 : 1;
  const samples: BloodGasSample[] = [];
  for (let i = 0; i < cols.lines.length; i++) {
    const t = cols.values.time ? cols.values.time[i] * tf : i;
    if (!Number.isFinite(t)) continue;
    const s: BloodGasSample = { timeS: t };
    const o2 = cols.values.paO2?.[i];
    const co2 = cols.values.paCO2?.[i];
    if (o2 !== undefined && Number.isFinite(o2)) s.paO2MmHg = o2 * fO2;
    if (co2 !== undefined && Number.isFinite(co2)) s.paCO2MmHg = co2 * fCO2;
    const label = cols.labels?.[i];
    if (label) s.label = label;
    if (s.paO2MmHg !== undefined || s.paCO2MmHg !== undefined) samples.push(s);
  }
  if (!cols.values.time)
    issues.push(
      makeIssue("warning", "no-time-column", "The blood-gas file has no time column; samples were numbered in file order."),
    );
  return { samples, issues };
}
