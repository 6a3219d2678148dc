import { makeIssue, measured, notDetermined, type Issue, type Measured, type Spirometry } from "../core";
import { provenanceOf } from "./indexSeries";

/** How MVV is obtained. */
export type MvvChoice = "measured" | "fev1x40" | "fev1x35";

export interface BreathingReserveOptions {
  /** @default "measured" when spirometry has MVV, else "fev1x40" (with an info issue) */
  mvvChoice?: MvvChoice;
}

export interface BreathingReserveResult {
  mvvChoice: MvvChoice | null;
  mvvLMin: Measured;
  /** BR = MVV − VEpeak, L/min. */
  reserveLMin: Measured;
  /** BR% = 100·(1 − VEpeak/MVV). */
  reservePercent: Measured;
  /** VEpeak/MVV, %. */
  veMvvPercent: Measured;
  issues: Issue[];
}

const MVV_SOURCES: Record<MvvChoice, string[]> = {
  measured: ["common-practice"],
  fev1x40: ["mvv-fev1x40", "otto-yanez-2020"],
  fev1x35: ["mvv-fev1x35", "mvv-fev1x35-practice", "otto-yanez-2020"],
};

/**
 * Peak VE/MVV above which the spirometry is questioned, %: our choice. Exercise VE near or slightly above MVV is seen in
 * severe COPD and athletes (VE/MVV ≥ 85 % is the ventilatory-limitation criterion, ERS 2019 — confirmed); well beyond it
 * the MVV, FEV1 or their units are more likely wrong than the patient.
 */
export const IMPLAUSIBLE_VE_MVV_PCT = 120;

/**
 * Measured MVV / FEV1 outside this range is questioned: our choice around the multipliers in use, 35–40 (×40 recalled
 * attribution to Campbell 1982; ×35 secondary; five literature multipliers compared by Otto-Yáñez et al. 2020, Front
 * Physiol — confirmed).
 */
export const MVV_FEV1_RATIO = { min: 20, max: 60 } as const;

/**
 * Breathing reserve from peak VE and MVV: MVV measured, or estimated as FEV1 × 40 (recalled attribution) or
 * FEV1 × 35 (used in practice, secondary); Otto-Yáñez 2020 (confirmed) advises against estimating.
 * BR = MVV − VEpeak (L/min), BR% = 100·(1 − VEpeak/MVV), VE/MVV = 100·VEpeak/MVV (definitions recalled).
 * Limits (interpretation layer): BR < 11 L/min (Hansen 1984, confirmed); VE/MVV ≥ 85% (ERS 2019, confirmed).
 *
 * Worked example: FEV1 3.2 L → MVV 128 (×40) or 112 (×35) L/min.
 */
export function breathingReserve(
  peakVe: Measured,
  spirometry: Spirometry | undefined,
  options: BreathingReserveOptions = {},
): BreathingReserveResult {
  const issues: Issue[] = [];
  const choice: MvvChoice | null = options.mvvChoice ?? (spirometry?.mvvLMin ? "measured" : spirometry?.fev1L ? "fev1x40" : null);
  const labels: Record<MvvChoice, string> = {
    measured: "MVV measured",
    fev1x40: "MVV estimated as FEV1 × 40",
    fev1x35: "MVV estimated as FEV1 × 35",
  };
  const mvvProv = provenanceOf(
    choice ? `mvv-${choice}` : "mvv",
    choice ? labels[choice] : "MVV",
    choice ? MVV_SOURCES[choice] : ["common-practice"],
    {
      inputs: { fev1L: spirometry?.fev1L ?? null, mvvMeasuredLMin: spirometry?.mvvLMin ?? null },
    },
  );
  let mvv: Measured;
  if (choice === "measured") {
    mvv =
      spirometry?.mvvLMin && spirometry.mvvLMin > 0
        ? measured(spirometry.mvvLMin, "L/min", mvvProv)
        : notDetermined("L/min", mvvProv, "measured MVV not given");
  } else if (choice) {
    const factor = choice === "fev1x40" ? 40 : 35;
    mvv =
      spirometry?.fev1L && spirometry.fev1L > 0
        ? measured(spirometry.fev1L * factor, "L/min", mvvProv)
        : notDetermined("L/min", mvvProv, "FEV1 not given");
    if (!options.mvvChoice && mvv.value !== null)
      issues.push(
        makeIssue(
          "info",
          "mvv-estimated",
          "MVV was not measured; it is estimated as FEV1 × 40. Estimation is discouraged (Otto-Yáñez 2020); measure MVV where possible.",
        ),
      );
  } else {
    mvv = notDetermined("L/min", mvvProv, "no spirometry (MVV or FEV1) given");
  }
  const brProv = (method: string, label: string) =>
    provenanceOf(method, label, ["breathing-reserve-definition", ...mvvProv.sourceIds], {
      inputs: { mvvLMin: mvv.value, vePeakLMin: peakVe.value },
    });
  const ok = mvv.value !== null && peakVe.value !== null;
  const reason = mvv.value === null ? (mvv.reason ?? "MVV not determinable") : (peakVe.reason ?? "peak VE not determinable");
  const m = mvv.value ?? NaN;
  const ve = peakVe.value ?? NaN;
  // spirometry that cannot be right: a check before ventilatory limitation is read from it
  if (ok && (100 * ve) / m > IMPLAUSIBLE_VE_MVV_PCT)
    issues.push(
      makeIssue(
        "warning",
        "ve-mvv-implausible",
        `Peak VE ${ve.toFixed(0)} L/min is ${((100 * ve) / m).toFixed(0)} % of the MVV (${m.toFixed(0)} L/min, ${labels[choice!]}): ` +
          `more than ${IMPLAUSIBLE_VE_MVV_PCT} % is rarely real. Check the spirometry values and their units before reading the breathing reserve or ventilatory limitation.`,
        { field: "mvvLMin" },
      ),
    );
  const ratio = spirometry?.mvvLMin && spirometry.fev1L ? spirometry.mvvLMin / spirometry.fev1L : null;
  if (ratio !== null && (ratio < MVV_FEV1_RATIO.min || ratio > MVV_FEV1_RATIO.max))
    issues.push(
      makeIssue(
        "warning",
        "mvv-fev1-implausible",
        `Measured MVV ${spirometry!.mvvLMin!.toFixed(0)} L/min is ${ratio.toFixed(0)} × FEV1 (${spirometry!.fev1L!.toFixed(2)} L); ` +
          `MVV usually lies near 35–40 × FEV1, and outside ${MVV_FEV1_RATIO.min}–${MVV_FEV1_RATIO.max} × one of the two is probably mistyped or poorly performed. Check them.`,
        { field: "mvvLMin" },
      ),
    );
  return {
    mvvChoice: choice,
    mvvLMin: mvv,
    reserveLMin: ok
      ? measured(m - ve, "L/min", brProv("breathing-reserve", "BR = MVV − peak VE"))
      : notDetermined("L/min", brProv("breathing-reserve", "BR"), reason),
    reservePercent: ok
      ? measured(100 * (1 - ve / m), "%", brProv("breathing-reserve-percent", "BR% = 100·(1 − peak VE/MVV)"))
      : notDetermined("%", brProv("breathing-reserve-percent", "BR%"), reason),
    veMvvPercent: ok
      ? measured((100 * ve) / m, "%", brProv("ve-mvv", "peak VE/MVV"))
      : notDetermined("%", brProv("ve-mvv", "VE/MVV"), reason),
    issues,
  };
}
