import {
  bloodGasMoment,
  bloodGasMomentWords,
  bloodGasTimeS,
  type BloodGasMoment,
  type BloodGasSample,
  type Phase,
} from "../breath";
import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
import { formatClock } from "../units";
import { provenanceOf } from "./indexSeries";
import { readAtTime, readAtTimeMode, type ReadAtTimeOptions } from "./valuesAtThreshold";

/** Constant of the Bohr-Enghoff form with VE at BTPS and VCO2 at STPD (recalled): VD/VT = 1 − 863/(PaCO2·VE/VCO2). */
export const BOHR_ENGHOFF_CONSTANT = 863;

/**
 * Where a sample placed by its label is read, seconds (our choice): a resting or warm-up sample over
 * the last minute of that phase, a peak or stage sample over the last 30 s of exercise or of the stage (where an
 * arterial sample "at peak" is drawn).
 */
export const LABEL_WINDOW_S = { phaseEnd: 60, peak: 30 } as const;

/**
 * The last sample during exercise is read as peak VD/VT; when it was drawn more than this many seconds before the end of
 * exercise an issue says so (our choice): VD/VT falls as exercise goes on (Wasserman-school texts, recalled), so an
 * earlier sample overstates VD/VT at peak.
 */
export const PEAK_SAMPLE_EARLY_S = 60;

const APPARATUS_NOTE = "valve and mouthpiece (apparatus) dead space not subtracted";

/** O2 fraction of dry room air (common practice). Supplemental oxygen is not supported: P(A−a)O2 assumes room air. */
export const ROOM_AIR_FIO2 = 0.2093;
/** Water vapour pressure at 37 °C, mmHg (common practice). */
export const WATER_VAPOUR_MMHG = 47;
/** Barometric pressure at sea level, mmHg (common practice), assumed for P(A−a)O2 when none is entered. */
export const SEA_LEVEL_PB_MMHG = 760;
/** Barometric pressures a user may enter, mmHg (our choice: sea level down to about 3 500 m). */
export const BAROMETRIC_PRESSURE_LIMITS_MMHG = { min: 480, max: 800 } as const;

/** Apparatus dead space a user may enter, mL (our choice: valves, mouthpieces and masks hold roughly 30–300 mL). */
export const APPARATUS_DEAD_SPACE_LIMITS_ML = { min: 0, max: 500 } as const;

export interface VdVtPoint {
  /** Time VE/VCO2 was read at, s: the sample's own time, or where its label placed it (`placedBy`). */
  timeS: number;
  label?: string;
  /** PaCO2 of the sample, mmHg, to 0.1 mmHg as shown (the computation uses the stored value). */
  paCO2MmHg: number;
  veVco2: Measured;
  vdVt: Measured;
  /** Phase the sample lies in. Samples in recovery or outside the recorded breaths give no point. */
  phase: Phase;
  /** Whether the time came from the file or from the sample's label ("rest", "peak", …). */
  placedBy: "time" | "label";
  /** True for the one point read as peak VD/VT: the last sample during exercise. Never true outside exercise. */
  atPeak: boolean;
  /** Tidal volume at the sample, L, when the apparatus dead space was subtracted (VDapparatus/VT). */
  vtL?: Measured;
  /**
   * Alveolar–arterial PO2 difference, mmHg, when the sample has PaO2 and PaCO2: PAO2 − PaO2 with PAO2 from the alveolar
   * gas equation at the RER read at the sample (room air; the entered or the sea-level barometric pressure).
   */
  aaGradient?: Measured;
}

interface Placed {
  g: BloodGasSample & { paCO2MmHg: number };
  timeS: number;
  placedBy: "time" | "label";
  moment?: BloodGasMoment;
  phase: Phase | null;
  /** Window VE/VCO2 is read over when placed by label, and its words. */
  window?: { windowS: number; words: string };
}

/**
 * Dead-space fraction VD/VT at each blood-gas sample with PaCO2, by the Bohr-Enghoff form
 * VD/VT = 1 − 863/(PaCO2 · VE/VCO2) − VDapparatus/VT with VE at BTPS and VCO2 at STPD (Bohr-Enghoff form with the
 * apparatus term, recalled). The apparatus (valve, mouthpiece or mask) dead space is subtracted when it is known
 * (`apparatusDeadSpaceMl`), with VT read at the sample time (the tidal-volume column, else VE / respiratory rate). When it
 * is not known, or VT cannot be read, nothing is subtracted and the value overstates physiological VD/VT by
 * VDapparatus/VT; every such value and an issue say so. Normal peak < 0.28 (Hansen 1984, confirmed).
 *
 * Placing each sample: its own time when the file gave one; otherwise its label (`bloodGasMoment`): rest or warm-up →
 * the last minute of that phase, peak / end of exercise → the last 30 s of exercise, stage N → the last 30 s of that
 * stage. A sample with neither gives no point (issue). Samples in recovery give no point (VD/VT is read at rest and during
 * exercise; issue). The last sample during exercise is the peak point (`atPeak`); with none during exercise no VD/VT is
 * given at all (the interpretation reads the last point as the peak value) and an issue says why. When every sample time
 * from the file falls before exercise starts (and not every one is labelled rest or warm-up), the times are probably
 * minutes read as seconds: a warning asks, and no VD/VT is read from them.
 *
 * VE/VCO2 is read at the sample time (see `readAtTime`).
 *
 * @example PaCO2 40 mmHg, VE/VCO2 30 → 1 − 863/1200 = 0.2808
 */
export function vdVt(
  test: ConditionedTest,
  gases: readonly BloodGasSample[] | undefined,
  options: ReadAtTimeOptions = {},
  apparatusDeadSpaceMl?: number,
  barometricPressureMmHg?: number,
): { points: VdVtPoint[]; issues: Issue[] } {
  const issues: Issue[] = [];
  const ex = test.exercise;
  const placed: Placed[] = [];
  const notPlaced: string[] = [];
  const inRecovery: Placed[] = [];
  const recoveryByLabel: string[] = [];
  for (const g of gases ?? []) {
    if (g.paCO2MmHg === undefined) continue;
    const gas = g as Placed["g"];
    const moment = bloodGasMoment(g.label);
    const t = bloodGasTimeS(g);
    if (t !== undefined) {
      placed.push({ g: gas, timeS: t, placedBy: "time", moment, phase: phaseAt(test, t) });
      continue;
    }
    if (moment?.kind === "recovery") {
      recoveryByLabel.push(g.label ?? "recovery");
      continue;
    }
    const where = moment ? placeByLabel(test, moment) : null;
    if (where && "timeS" in where) {
      placed.push({
        g: gas,
        timeS: where.timeS,
        placedBy: "label",
        moment,
        phase: phaseAt(test, where.timeS),
        window: where,
      });
    } else {
      notPlaced.push(
        g.label
          ? `"${g.label}" (${where ? where.reason : "the label names no moment of the test"})`
          : "a sample with no label (no time either)",
      );
    }
  }
  if (notPlaced.length > 0)
    issues.push(
      makeIssue(
        "warning",
        "blood-gas-not-placed",
        `${notPlaced.length} blood-gas sample(s) have no time and could not be placed by their label: ${notPlaced.join("; ")}. ` +
          "They are kept with the test but not used for VD/VT. Give each sample a time, or a label such as rest, peak, " +
          "end of exercise or stage 3.",
      ),
    );

  // label and time disagree: the time is used, and said
  for (const p of placed) {
    if (p.placedBy !== "time" || !p.moment || p.phase === null) continue;
    const expected = expectedPhase(p.moment);
    if (expected !== p.phase)
      issues.push(
        makeIssue(
          "warning",
          "blood-gas-label-time-conflict",
          `The blood gas labelled "${p.g.label}" (${bloodGasMomentWords(p.moment)}) has the time ${formatClock(p.timeS)}, ` +
            `which lies in ${phaseWords(p.phase)}. The time is used${expected === "exercise" ? ", so no peak VD/VT is read from it" : ""}; ` +
            "check the time and its unit.",
          { timeS: p.timeS },
        ),
      );
  }

  // every file time before exercise: probably minutes read as seconds
  const timed = placed.filter((p) => p.placedBy === "time");
  const timesDoubtful =
    ex !== null &&
    timed.length > 0 &&
    timed.every((p) => p.timeS < ex.startS) &&
    !timed.every((p) => p.moment?.kind === "rest" || p.moment?.kind === "warmup");
  if (timesDoubtful) {
    const times = timed.map((p) => p.timeS);
    issues.push(
      makeIssue(
        "warning",
        "blood-gas-times-before-exercise",
        `Every blood-gas sample time (${formatClock(Math.min(...times))}–${formatClock(Math.max(...times))}) falls before ` +
          `exercise starts at ${formatClock(ex.startS)}. Are the times in minutes? If so, choose "minutes" on the inputs ` +
          "page and read the blood-gas file again. No VD/VT is read from these samples.",
      ),
    );
  }

  // recovery samples give no point
  const kept: (Placed & { phase: Phase })[] = [];
  const outside: Placed[] = [];
  for (const p of placed) {
    if (p.phase === null) outside.push(p);
    else if (p.phase === "recovery") inRecovery.push(p);
    else kept.push({ ...p, phase: p.phase });
  }
  if (outside.length > 0)
    issues.push(
      makeIssue(
        "warning",
        "blood-gas-outside-recording",
        `${outside.length} blood-gas sample(s) lie outside the recorded breaths (${outside.map((p) => formatClock(p.timeS)).join(", ")}), ` +
          "so no VE/VCO2 and no VD/VT can be read for them. Check their times and the time unit.",
        { timeS: outside[0].timeS },
      ),
    );
  const recoveryNames = [...inRecovery.map((p) => p.g.label ?? formatClock(p.timeS)), ...recoveryByLabel];
  if (recoveryNames.length > 0)
    issues.push(
      makeIssue(
        "info",
        "blood-gas-in-recovery",
        `${recoveryNames.length} blood-gas sample(s) lie in recovery (${recoveryNames.join(", ")}): ` +
          "VD/VT is read at rest and during exercise only, so they are not used for it.",
        inRecovery.length > 0 ? { timeS: inRecovery[0].timeS } : undefined,
      ),
    );

  kept.sort((a, b) => a.timeS - b.timeS);
  const exerciseIdx = kept.map((p, i) => (p.phase === "exercise" && !timesDoubtful ? i : -1)).filter((i) => i >= 0);
  const peakIdx = exerciseIdx.length > 0 ? exerciseIdx[exerciseIdx.length - 1] : -1;
  if (kept.length > 0 && peakIdx < 0 && !timesDoubtful)
    issues.push(
      makeIssue(
        "warning",
        "no-blood-gas-in-exercise",
        ex
          ? `No blood gas lies in the exercise phase (${formatClock(ex.startS)}–${formatClock(ex.endS)}), so no peak VD/VT ` +
              "is read; a resting VD/VT alone is not given."
          : "The exercise phase of this test was not found, so no blood gas can be read as peak VD/VT.",
      ),
    );
  if (peakIdx >= 0 && ex) {
    const early = ex.endS - kept[peakIdx].timeS;
    if (early > PEAK_SAMPLE_EARLY_S)
      issues.push(
        makeIssue(
          "info",
          "blood-gas-peak-early",
          `The last blood gas during exercise (${kept[peakIdx].g.label ?? formatClock(kept[peakIdx].timeS)}) was drawn ` +
            `${formatClock(early)} before the end of exercise; VD/VT falls as exercise goes on, so the peak VD/VT read ` +
            "from it may be overstated.",
          { timeS: kept[peakIdx].timeS },
        ),
      );
  }

  const pb = barometricPressureMmHg ?? SEA_LEVEL_PB_MMHG;
  // PAO2 = FiO2·(PB − 47) − PaCO2·[FiO2 + (1 − FiO2)/R] (alveolar gas equation, full form; common practice), R read at the
  // sample as VCO2/VO2 the way VE/VCO2 is read; P(A−a)O2 = PAO2 − PaO2
  const alveolarArterial = (p: Placed, readOptions: ReadAtTimeOptions): Measured => {
    const r = readAtTime(test, "vco2MlMin", p.timeS, "1", { ...readOptions, denominator: "vo2MlMin", scale: 1 });
    const prov = provenanceOf(
      "aa-gradient-alveolar-gas-equation",
      `P(A−a)O2 = FiO2·(PB − 47) − PaCO2·[FiO2 + (1 − FiO2)/R] − PaO2; room air (FiO2 ${ROOM_AIR_FIO2}), PB ${pb} mmHg${barometricPressureMmHg === undefined ? " (sea level assumed)" : ""}, R read at the sample`,
      ["alveolar-gas-equation", "hansen-1984-limits"],
      {
        window: r.provenance.window,
        inputs: {
          paO2MmHg: round(p.g.paO2MmHg!, 1),
          paCO2MmHg: round(p.g.paCO2MmHg, 1),
          rer: r.value === null ? null : round(r.value, 3),
          barometricPressureMmHg: pb,
          fio2: ROOM_AIR_FIO2,
        },
      },
    );
    if (!(p.g.paCO2MmHg > 0)) return notDetermined("mmHg", prov, "PaCO2 is not positive");
    if (r.value === null || !(r.value > 0))
      return notDetermined("mmHg", prov, r.reason ?? "RER not available at the sample time");
    const pAO2 = ROOM_AIR_FIO2 * (pb - WATER_VAPOUR_MMHG) - p.g.paCO2MmHg * (ROOM_AIR_FIO2 + (1 - ROOM_AIR_FIO2) / r.value);
    return measured(pAO2 - p.g.paO2MmHg!, "mmHg", prov);
  };
  const points: VdVtPoint[] = [];
  kept.forEach((p, i) => {
    const readOptions: ReadAtTimeOptions & { denominator: "vco2MlMin"; scale: number; label?: string } = {
      ...options,
      denominator: "vco2MlMin",
      scale: 1000,
    };
    if (p.window) {
      readOptions.windowS = p.window.windowS;
      if (readAtTimeMode(test, options) === "centred-window")
        readOptions.label = `VE/VCO2: mean of breaths over ${p.window.words} (the sample has no time and was placed by its label)`;
    }
    const veVco2 = readAtTime(test, "veLMin", p.timeS, "1", readOptions);
    const placedWords = p.window ? `, placed by its label at ${p.window.words}` : "";
    // tidal volume at the sample, read the same way as VE/VCO2: the VT column, else VE / respiratory rate
    const vtRead = (() => {
      if (apparatusDeadSpaceMl === undefined) return undefined;
      const plain: ReadAtTimeOptions = { ...options, ...(p.window ? { windowS: p.window.windowS } : {}) };
      if (test.clean.some((r) => typeof r.vtL === "number")) return readAtTime(test, "vtL", p.timeS, "L", plain);
      return readAtTime(test, "veLMin", p.timeS, "L", { ...plain, denominator: "rrBrMin" });
    })();
    const vtL = vtRead && vtRead.value !== null && vtRead.value > 0 ? vtRead.value : null;
    const subtract = apparatusDeadSpaceMl !== undefined && vtL !== null;
    const prov = provenanceOf(
      "vd-vt-bohr-enghoff",
      subtract
        ? `VD/VT = 1 − 863/(PaCO2 · VE/VCO2) − VDapparatus/VT${placedWords}; apparatus dead space ${apparatusDeadSpaceMl} mL, VT ${vtL.toFixed(2)} L at the sample`
        : `VD/VT = 1 − 863/(PaCO2 · VE/VCO2)${placedWords}; ${APPARATUS_NOTE} (overstates physiological VD/VT by VDapparatus/VT)`,
      ["bohr-enghoff", "hansen-1984-limits"],
      {
        window: veVco2.provenance.window,
        inputs: {
          paCO2MmHg: round(p.g.paCO2MmHg, 1),
          veVco2: veVco2.value === null ? null : round(veVco2.value, 2),
          constant: BOHR_ENGHOFF_CONSTANT,
          ...(subtract ? { apparatusDeadSpaceMl, vtL: round(vtL, 3) } : {}),
        },
      },
    );
    let v: Measured;
    if (!(p.g.paCO2MmHg > 0)) {
      v = notDetermined("1", prov, "PaCO2 is not positive");
      issues.push(
        makeIssue("warning", "paco2-not-positive", "A blood gas has a PaCO2 that is not positive; VD/VT skipped.", {
          timeS: p.timeS,
        }),
      );
    } else if (timesDoubtful)
      v = notDetermined(
        "1",
        prov,
        "every blood-gas time in the file falls before exercise starts; the times may be minutes read as seconds",
      );
    else if (peakIdx < 0)
      v = notDetermined(
        "1",
        prov,
        "no blood gas was drawn during exercise; VD/VT is given only with a sample during exercise, read as its peak value",
      );
    else if (veVco2.value === null) v = notDetermined("1", prov, veVco2.reason ?? "VE/VCO2 not available at the sample time");
    else
      v = measured(
        1 - BOHR_ENGHOFF_CONSTANT / (p.g.paCO2MmHg * veVco2.value) - (subtract ? apparatusDeadSpaceMl / 1000 / vtL : 0),
        "1",
        prov,
      );
    const aaGradient =
      p.g.paO2MmHg !== undefined && !timesDoubtful && peakIdx >= 0 ? alveolarArterial(p, readOptions) : undefined;
    points.push({
      timeS: p.timeS,
      phase: p.phase,
      label: p.g.label,
      paCO2MmHg: round(p.g.paCO2MmHg, 1),
      veVco2,
      vdVt: v,
      placedBy: p.placedBy,
      atPeak: i === peakIdx,
      ...(subtract && vtRead ? { vtL: vtRead } : {}),
      ...(aaGradient ? { aaGradient } : {}),
    });
  });
  if (barometricPressureMmHg === undefined && points.some((p) => p.aaGradient?.value != null))
    issues.push(
      makeIssue(
        "info",
        "aa-gradient-sea-level",
        `P(A−a)O2 assumes sea-level barometric pressure (${SEA_LEVEL_PB_MMHG} mmHg) and room air: no barometric pressure was entered with the test conduct. Above sea level it reads high by about ${ROOM_AIR_FIO2} × (${SEA_LEVEL_PB_MMHG} − the true pressure), e.g. 13 mmHg at 700 mmHg.`,
      ),
    );
  // a dead space larger than the one measured at a sample (a negative VD/VT) cannot be right: the entry is wrong (a volume
  // in another unit, or a mask volume that is not rebreathed); no VD/VT is read from it rather than a too-low one
  const negative = points.filter((p) => p.vtL !== undefined && p.vdVt.value !== null && p.vdVt.value < 0);
  if (apparatusDeadSpaceMl !== undefined && negative.length > 0) {
    const why = `the apparatus dead space entered (${apparatusDeadSpaceMl} mL) is larger than the whole dead space measured at ${negative.map((p) => p.label ?? formatClock(p.timeS)).join(", ")}; check the value`;
    for (const p of points) if (p.vtL !== undefined && p.vdVt.value !== null) p.vdVt = notDetermined("1", p.vdVt.provenance, why);
    issues.push(
      makeIssue(
        "warning",
        "vdvt-apparatus-too-large",
        `No VD/VT is given: ${why} (VD/VT minus VDapparatus/VT came out below zero).`,
        { timeS: negative[0].timeS },
      ),
    );
  }
  const computed = points.filter((p) => p.vdVt.value !== null);
  const unsubtracted = computed.filter((p) => p.vtL === undefined);
  if (apparatusDeadSpaceMl !== undefined && unsubtracted.length > 0)
    issues.push(
      makeIssue(
        "warning",
        "vdvt-apparatus-not-subtracted",
        `The apparatus dead space (${apparatusDeadSpaceMl} mL) could not be subtracted from VD/VT at ` +
          `${unsubtracted.map((p) => p.label ?? formatClock(p.timeS)).join(", ")}: no tidal volume (or VE and respiratory ` +
          "rate) at the sample time. Those values overstate physiological VD/VT by VDapparatus/VT.",
        { timeS: unsubtracted[0].timeS },
      ),
    );
  if (apparatusDeadSpaceMl === undefined && computed.length > 0)
    issues.push(
      makeIssue(
        "info",
        "vdvt-apparatus-dead-space",
        "VD/VT is computed from PaCO2 and VE/VCO2 without subtracting the valve and mouthpiece (apparatus) dead space, " +
          "so it overstates the physiological VD/VT by VDapparatus/VT (Bohr-Enghoff form with the apparatus term, " +
          "recalled; e.g. 0.05 for 100 mL at a tidal volume of 2 L). The normal peak VD/VT below 0.28 (Hansen 1984) is for " +
          "physiological VD/VT: read a value near the cut-off with this in mind. Enter the apparatus dead space with the " +
          "test conduct to have it subtracted.",
      ),
    );
  return { points, issues };
}

function round(x: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(x * f) / f;
}

/** The phase the label's moment lies in. */
function expectedPhase(m: BloodGasMoment): Phase {
  return m.kind === "peak" || m.kind === "stage" ? "exercise" : m.kind;
}

function phaseWords(p: Phase): string {
  return p === "warmup" ? "the warm-up" : p === "exercise" ? "exercise" : p === "rest" ? "the resting phase" : "recovery";
}

/**
 * Phase at a time: exercise within the exercise span; before it, the phase span the time lies in (rest when in none);
 * after it, recovery; null before the first or after the last breath. Without an exercise span, the phase span the time
 * lies in.
 */
function phaseAt(test: ConditionedTest, t: number): Phase | null {
  if (test.clean.length === 0) return null;
  if (t < test.clean[0].timeS || t > test.clean[test.clean.length - 1].timeS) return null;
  const ex = test.exercise;
  if (ex) {
    if (t >= ex.startS && t <= ex.endS) return "exercise";
    if (t > ex.endS) return "recovery";
  }
  const span = test.phases.find((s) => t >= s.startS && t <= s.endS && (!ex || s.phase !== "exercise"));
  if (span) return span.phase;
  // between spans before exercise: the last span begun before t
  const before = test.phases.filter((s) => s.startS <= t && s.phase !== "exercise" && s.phase !== "recovery");
  return before.length > 0 ? before[before.length - 1].phase : ex ? "rest" : null;
}

/**
 * Where a label puts a sample without a time (see `LABEL_WINDOW_S`): the centre of the window VE/VCO2 is read over, or
 * why it cannot be placed. On stage tables the row closing the phase or stage is read.
 */
function placeByLabel(
  test: ConditionedTest,
  m: BloodGasMoment,
): { timeS: number; windowS: number; words: string } | { reason: string } {
  const ex = test.exercise;
  const stageData = test.shape === "stage";
  const lastRowIn = (lo: number, hi: number) => {
    const rows = test.clean.filter((r) => r.timeS >= lo && r.timeS <= hi);
    return rows.length > 0 ? rows[rows.length - 1].timeS : undefined;
  };
  const endOf = (start: number, end: number, windowS: number, what: string) => {
    if (stageData) {
      const t = lastRowIn(start, end);
      return t === undefined
        ? { reason: `no row of the table lies in ${what}` }
        : { timeS: t, windowS: 1, words: `the last row of ${what} (${formatClock(t)})` };
    }
    const from = Math.max(start, end - windowS);
    return {
      timeS: (from + end) / 2,
      windowS: end - from,
      words: `${formatWindow(end - from)} of ${what} (${formatClock(from)}–${formatClock(end)})`,
    };
  };
  switch (m.kind) {
    case "recovery":
      return { reason: "recovery samples are not used for VD/VT" };
    case "peak":
      return ex ? endOf(ex.startS, ex.endS, LABEL_WINDOW_S.peak, "exercise") : { reason: "the exercise phase was not found" };
    case "rest":
    case "warmup": {
      const spans = test.phases.filter((s) => s.phase === m.kind && (!ex || s.endS <= ex.startS));
      const span = spans[spans.length - 1];
      const what = m.kind === "rest" ? "rest" : "the warm-up";
      return span ? endOf(span.startS, span.endS, LABEL_WINDOW_S.phaseEnd, what) : { reason: `the test has no ${what} phase` };
    }
    case "stage": {
      const rows = test.clean.filter((r) => r.stage === m.stage);
      if (rows.length === 0) return { reason: `the test has no stage ${m.stage}` };
      return endOf(rows[0].timeS, rows[rows.length - 1].timeS, LABEL_WINDOW_S.peak, `stage ${m.stage}`);
    }
  }
}

function formatWindow(s: number): string {
  if (Math.abs(s - 60) < 0.5) return "the last minute";
  return s > 60 ? `the last ${Math.round(s / 60)} min` : `the last ${Math.round(s)} s`;
}
