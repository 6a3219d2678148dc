import Link from "next/link";
import { notFound } from "next/navigation";
import { analyse } from "@/lib/analysis";
import { EVIDENCE_LABEL, type Measured } from "@/lib/core";
import { EQUATIONS } from "@/lib/predicted";
import { ATRIAL_FIBRILLATION_HR_NOTE, heartRateNotes, hrReserveNote, listCutoffChoices } from "@/lib/interpret";
import { analysisCharts, bandNote, keyValueNotRead } from "@/lib/report";
import {
  BAND_MEANING,
  EOV_CARRY_OVER_CODE,
  METHOD_REASON_SEPARATOR,
  RAMP_LAG_SPREAD_S,
  slopeToVt2Name,
  veVco2BandEndsWords,
  type ThresholdEstimate,
} from "@/lib/thresholds";
import { AVERAGED_ROW_INTERVAL_S, medianRowIntervalS } from "@/lib/signal";
import { displayUnit, formatClock, formatNumber } from "@/lib/units";
import { getLabDefaults } from "@/lib/store/labSettings";
import { getTest, listAnalysisVersions } from "@/lib/store/tests";
import { auditTestViewed, reportStanding, standingWords } from "@/lib/store/reports";
import { Chart } from "../../components/Chart";
import { IssueList } from "../../components/IssueList";
import { TableScroll } from "../../components/TableScroll";
import { FIELD_LABEL, readAsShortText, shortFieldLabel, type FieldKey } from "./columns/fieldChoices";
import { loadColumnReview } from "./columns/loadColumnReview";
import { fmt, HowFound, SourceList } from "./parts/HowFound";
import { ExerciseSpanForm } from "./parts/ExerciseSpanForm";
import { SetAsideForm } from "./parts/SetAsideForm";
import { Vo2CheckedForm } from "./parts/Vo2CheckedForm";
import { OverrideForm, RemoveOverrideForm } from "./parts/OverrideForm";
import { SettingsForm } from "./parts/SettingsForm";
import { SeverityScale } from "./parts/SeverityScale";
import { settingsToken } from "./recordToken";
import { pageAccess } from "../../access";

export const dynamic = "force-dynamic";

/** Heart rate is shown in beats per minute everywhere in the app ("1/min" is the canonical unit). */
const HR_UNIT = "bpm";

/** Decimals of a key value, the same rule as the report (whole mL/min, W and bpm; one decimal otherwise). */
const keyDecimals = (unit: string) => (unit === "mL/min" || unit === "W" || unit === "1/min" ? 0 : 1);

/** Display unit of a key value: heart rate in bpm, other units as the unit layer writes them. */
const keyUnit = (key: string, unit: string) => (key === "peakHr" ? HR_UNIT : displayUnit(unit));

/** A number and its unit that never part at a line end ("122 bpm"); a missing value ("—") stands without its unit. */
const nb = (value: string, unit: string) => (value === "—" ? value : `${value}\u00a0${unit}`);

/** Effort criterion outcome in plain words. */
const OUTCOME_WORD = (o: boolean | null) => (o === true ? "met" : o === false ? "not met" : "not assessable");

/**
 * What the file's rows are, with their count, for the test header: "12 stages", "110 rows, about 10-s time averages" when
 * the rows are 6 s or more apart (time averages exported by the cart, the same rule and spacing as the analysis,
 * lib/signal/rowSpacing.ts), else "740 breaths".
 */
function rowCountWords(table: { shape: string; rows: readonly { timeS: number }[] }): string {
  const n = table.rows.length;
  if (table.shape === "stage") return `${n} ${n === 1 ? "stage" : "stages"}`;
  const intervalS = medianRowIntervalS(table.rows.map((r) => r.timeS));
  if (intervalS >= AVERAGED_ROW_INTERVAL_S)
    return `${n} ${n === 1 ? "row" : "rows"}, about ${Math.round(intervalS)}-s time averages`;
  return `${n} ${n === 1 ? "breath" : "breaths"}`;
}

const AVERAGING_KEY: Record<string, string> = {
  none: "none",
  "rolling-time:30": "rolling-30",
  "time-bin:10": "bin-10",
  "time-bin:20": "bin-20",
  "time-bin:30": "bin-30",
  "breath-count:7": "breaths-7",
  "middle-of-seven:7": "middle-5-of-7",
};

export default async function TestPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const access = await pageAccess(`/tests/${id}`);
  const signedInName = access.mode === "account" ? access.account.displayName : undefined;
  const testId = Number(id);
  if (!Number.isInteger(testId)) notFound();
  const test = getTest(testId);
  if (!test) notFound();
  auditTestViewed(access.actor, testId, "analysis");

  if (!test.record) {
    // Mapping columns by hand helps only when the kept file reads as a table (the column page says the same).
    const review = await loadColumnReview(testId);
    const mappable = Boolean(review?.format);
    return (
      <>
        <h1>{test.label}</h1>
        <section className="panel" data-testid="refused">
          <h2 style={{ marginTop: 0 }}>This file could not be used</h2>
          <p>The original file is kept exactly as uploaded ({test.fileName}). What to fix:</p>
          <IssueList issues={test.importIssues} />
          {test.importColumns.length > 0 ? <ColumnTable columns={test.importColumns} /> : null}
          {test.uploadId ? <a href={`/api/uploads/${test.uploadId}`}>Download the original file</a> : null}
          {mappable ? (
            <p>
              <Link href={`/tests/${testId}/columns`} data-testid="columns-link">
                Map the columns by hand and read the file again →
              </Link>
            </p>
          ) : (
            <p data-testid="not-a-table">
              This file cannot be read as a table, so there are no columns to map. Export the test again from the recording system
              as a CSV or XLSX file (one row per breath or stage, one column per quantity, names in the first row) and upload that
              file from the <Link href="/">test register</Link>.
            </p>
          )}
        </section>
      </>
    );
  }

  const versions = listAnalysisVersions(testId);
  const standing = reportStanding(testId);
  const settings = versions[0]?.settings ?? getLabDefaults();
  // the analysis version this page shows, sent back by its forms (a save from a stale page is refused)
  const versionToken = settingsToken(testId);
  const record = test.record;
  const result = analyse(record, settings);
  const ix = result.indices;
  const pk = ix.peaks;
  // the carry-over of breath VE noise, when an EOV call was marked for it
  const eovCarryOver = ix.eov.issues.some((i) => i.code === EOV_CARRY_OVER_CODE) ? ix.eov.breathNoiseCarryOver : null;
  const charts = analysisCharts(result);
  const erg = record.ergometer;
  const p = record.patient;
  const av = result.conditioned.averaging;
  const effort = result.interpretation.effort;
  // threshold method id → its label, so a consensus's "how was this found?" names its methods in words
  const methodLabels = Object.fromEntries(result.thresholds.methods.map((m) => [m.id, `${m.which.toUpperCase()} ${m.label}`]));
  const avKey = AVERAGING_KEY[av.kind === "none" ? "none" : `${av.kind}:${av.seconds ?? av.breaths}`] ?? "none";
  const eqOptions = (quantities: string[]) =>
    EQUATIONS.filter(
      (e) =>
        quantities.includes(e.quantity) && e.kind !== "performance-estimate" && (e.ergometer === "both" || e.ergometer === erg),
    ).map((e) => ({
      id: e.id,
      label: e.label,
    }));

  return (
    <>
      <h1 data-testid="test-title">{test.label}</h1>
      <p className="how">
        {p.sex ?? "sex not given"}, {p.ageY ?? "?"} y, {p.heightCm ?? "?"} cm, {p.weightKg ?? "?"} kg · {erg} · referral:{" "}
        {record.referral} · {test.fileName ? `file ${test.fileName}` : "no uploaded file kept"}
        {record.upload?.selected ? <span data-testid="selected-record">, the test where {record.upload.selected}</span> : null} (
        <span data-testid="row-count">{rowCountWords(record.table)}</span>) · analysis version{" "}
        {versions[0]?.version ?? "lab defaults"} · engine {result.engineVersion}
      </p>
      <p className="row">
        <Link href={`/tests/${testId}/report`} data-testid="report-link">
          Draft report and signature →
        </Link>{" "}
        <span
          data-testid="report-standing"
          className={standing?.newest === "signed" && !standing.analysisChanged ? "how" : "draft-word"}
        >
          Report: {standingWords(standing)}
          {standing?.newest === "signed" && !standing.analysisChanged ? "" : ". The values on this page are not a signed report."}
        </span>
        <Link href={`/tests/${testId}/columns`} data-testid="columns-link">
          How the file was read
        </Link>{" "}
        <Link href={`/tests/${testId}/patient`} data-testid="patient-link">
          Patient and test details
        </Link>{" "}
        <Link href={`/tests/${testId}/inputs`} data-testid="inputs-link">
          Lactate, gases, spirometry, context
        </Link>
        {test.uploadId ? <a href={`/api/uploads/${test.uploadId}`}>original file</a> : null}
        {test.demo ? <span className="tag">invented demo data</span> : null}
      </p>

      <nav className="how" aria-label="Sections of this analysis" style={{ display: "flex", gap: "0.8rem", flexWrap: "wrap" }}>
        <a href="#key-results">results</a>
        <a href="#thresholds">thresholds</a>
        <a href="#charts">charts</a>
        <a href="#indices">indices</a>
        <a href="#domains">domains</a>
        <a href="#interpretation">interpretation</a>
        <a href="#patterns">patterns</a>
        <a href="#schemes">schemes</a>
        <a href="#quality">data quality</a>
        <a href="#settings">settings</a>
      </nav>
      <section className="panel" data-testid="effort">
        <h2 style={{ marginTop: 0 }}>Test validity and effort</h2>
        <p>
          <strong data-testid="effort-verdict">{effort.label}.</strong>{" "}
          {effort.peakConclusionsAllowed
            ? "Peak values are interpreted."
            : "Peak values are not interpreted; only effort-independent values (VE/VCO2 slope, OUES, VT1) are."}
        </p>
        <ul className="how" data-testid="effort-criteria">
          {effort.criteria.map((c) => (
            <li key={c.ruleId}>
              {/* the criterion named by what it asks, then its outcome ("VO2 plateau at peak: not met") */}
              {c.label}: <span className="tag">{OUTCOME_WORD(c.outcome)}</span> — {c.text}
            </li>
          ))}
        </ul>
        {effort.borderline ? (
          <p className="how" data-testid="effort-borderline">
            Near a cut-off: {effort.borderline}.
          </p>
        ) : null}
      </section>

      <h2 id="key-results">Key results against predicted</h2>
      <TableScroll label="Key results against predicted">
        <table className="wide" data-testid="key-results">
          <thead>
            <tr>
              <th>Measure</th>
              <th className="num">Measured</th>
              <th className="num">Predicted</th>
              <th className="num">% predicted</th>
              <th>Equation</th>
              <th>How found</th>
            </tr>
          </thead>
          <tbody>
            {result.comparisons.map((c) => (
              <tr key={c.key} data-testid={`row-${c.key}`}>
                <td>{c.label}</td>
                <td className="num">{nb(fmt(c.measured, keyDecimals(c.measured.unit)), keyUnit(c.key, c.measured.unit))}</td>
                <td className="num">
                  {formatNumber(c.predicted?.value, keyDecimals(c.measured.unit))}
                  {c.predicted?.lln !== undefined && c.predicted.lln !== null ? (
                    <div className="how">LLN {formatNumber(c.predicted.lln, keyDecimals(c.measured.unit))}</div>
                  ) : null}
                </td>
                <td className="num">
                  <PctPredicted pct={c.percentPredicted} notRead={keyValueNotRead(result, c.key)} testId={`not-read-${c.key}`} />
                  {c.key === "peakHr" && heartRateNotes(record.patient).length > 0 ? (
                    <div className="how" data-testid="beta-blocker-hr-note">
                      {heartRateNotes(record.patient).join("; ")}
                    </div>
                  ) : null}
                  {c.key === "peakO2Pulse" && record.patient.atrialFibrillation === true ? (
                    <div className="how">{ATRIAL_FIBRILLATION_HR_NOTE}</div>
                  ) : null}
                </td>
                <td className="how">
                  {c.predicted
                    ? `${c.predicted.equationLabel} (${EVIDENCE_LABEL[c.predicted.status]})`
                    : "no applicable equation"}
                  {(c.predicted?.issues ?? [])
                    .filter((i) => i.severity !== "info")
                    .map((i) => (
                      <div key={i.code + i.message} className="sev-warning" data-testid={`predicted-caution-${c.key}`}>
                        {i.message}
                      </div>
                    ))}
                </td>
                <td>
                  <HowFound m={c.measured} methodLabels={methodLabels} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableScroll>
      {result.weightBasis?.actual &&
      result.weightBasis.ideal &&
      (result.weightBasis.changesConclusion || (result.weightBasis.bmiKgM2 ?? 0) >= 30) ? (
        <p
          className={result.weightBasis.changesConclusion ? "sev-warning" : "how"}
          data-testid="weight-basis"
          style={{ padding: "0.3rem 0.5rem" }}
        >
          Weight basis (BMI {result.weightBasis.bmiKgM2?.toFixed(1) ?? "—"} kg/m²): on actual weight{" "}
          {result.weightBasis.actual.weightKg.toFixed(0)} kg peak VO2 is{" "}
          {result.weightBasis.actual.percentPredicted?.toFixed(0) ?? "—"} % predicted (
          {result.weightBasis.actual.measuredMlKgMin.toFixed(1)} mL/kg/min); on predicted weight{" "}
          {result.weightBasis.ideal.weightKg.toFixed(0)} kg it is {result.weightBasis.ideal.percentPredicted?.toFixed(0) ?? "—"} %
          ({result.weightBasis.ideal.measuredMlKgMin.toFixed(1)} mL/kg/min).
          {result.weightBasis.changesConclusion
            ? " The two bases lead to different readings: consider the patient's body composition."
            : ""}
        </p>
      ) : null}
      <p className="how" data-testid="peak-summary">
        Peak values: {pk.vo2MlMin.provenance.label}. Display averaging: {av.label}. Test duration{" "}
        {pk.testDurationS.value !== null ? formatClock(pk.testDurationS.value) : "—"}, exercise{" "}
        {pk.exerciseDurationS.value !== null ? formatClock(pk.exerciseDurationS.value) : "—"}; peak RER {fmt(pk.rerMax, 2)}, peak
        VE {fmt(pk.veLMin, 0)} L/min.
      </p>

      <h2 id="thresholds">Thresholds</h2>
      <div className="grid2">
        <ThresholdCard
          testId={testId}
          t={result.thresholds.vt1}
          at={ix.atVt1}
          title="VT1 (anaerobic threshold)"
          predVo2={result.predicted.values.vo2PeakMlMin?.value ?? null}
          methodLabels={methodLabels}
          versionToken={versionToken}
          signedInName={signedInName}
        />
        <ThresholdCard
          testId={testId}
          t={result.thresholds.vt2}
          at={ix.atVt2}
          title="VT2 (respiratory compensation point)"
          predVo2={result.predicted.values.vo2PeakMlMin?.value ?? null}
          methodLabels={methodLabels}
          versionToken={versionToken}
          signedInName={signedInName}
        />
      </div>
      {[result.thresholds.vt1, result.thresholds.vt2].some((t) => t.band && !t.overridden) || ix.veVco2.slopeToVt2.band ? (
        <p data-testid="band-meaning">
          <small>{BAND_MEANING}</small>
        </p>
      ) : null}
      <details className="panel">
        <summary>Each method&apos;s estimate</summary>
        <TableScroll label="Each method's threshold estimate">
          <table className="wide" data-testid="threshold-methods">
            <thead>
              <tr>
                <th>Method</th>
                <th className="num">VO2 (mL/min)</th>
                <th className="num">Time</th>
                <th>Quality</th>
                <th>Reasons</th>
              </tr>
            </thead>
            <tbody>
              {result.thresholds.methods.map((m) => (
                <tr key={m.id}>
                  <td>
                    {m.which.toUpperCase()} · {m.label}
                    {/* folded, so a method's several citations do not make its row many screens tall */}
                    {m.sourceIds.length > 0 ? (
                      <details className="how">
                        <summary>sources ({m.sourceIds.length})</summary>
                        <SourceList ids={m.sourceIds} />
                      </details>
                    ) : null}
                  </td>
                  <td className="num">{fmt(m.vo2MlMin)}</td>
                  <td className="num nowrap">{m.timeS !== null ? formatClock(m.timeS) : "—"}</td>
                  <td className="nowrap">{m.quality}</td>
                  <td className="how">{m.reasons.join("; ")}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableScroll>
      </details>

      <h2 id="charts">Charts</h2>
      <div className="grid2" data-testid="charts">
        {charts.map((c) => (
          <Chart key={c.id} spec={c} width={520} height={320} />
        ))}
      </div>

      <h2 id="indices">Ventilatory, cardiac and gas-exchange indices</h2>
      <TableScroll label="Ventilatory, cardiac and gas-exchange indices">
        <table className="label-value" data-testid="indices">
          <tbody>
            <IndexRow
              label={slopeToVt2Name(ix.veVco2.slopeToVt2)}
              m={ix.veVco2.slopeToVt2.slope}
              d={1}
              extra={[`intercept ${fmt(ix.veVco2.slopeToVt2.intercept, 1)} L/min`, bandNote(ix.veVco2.slopeToVt2, 1)]
                .filter(Boolean)
                .join("; ")}
            />
            <IndexRow
              label="VE/VCO2 slope, whole exercise"
              m={ix.veVco2.slopeWholeExercise.slope}
              d={1}
              extra={[
                `intercept ${fmt(ix.veVco2.slopeWholeExercise.intercept, 1)} L/min`,
                bandNote(ix.veVco2.slopeWholeExercise, 1),
              ]
                .filter(Boolean)
                .join("; ")}
            />
            <IndexRow label="Lowest VE/VCO2" m={ix.veVco2.nadir} d={1} />
            <IndexRow
              label="VE/VCO2 at VT1"
              m={ix.veVco2.atVt1}
              d={1}
              extra={ix.veVco2.atVt1.value !== null ? (veVco2BandEndsWords(ix.atVt1, "VT1") ?? undefined) : undefined}
            />
            {ix.oues.fits.map((f) => (
              <IndexRow
                key={f.fraction}
                label={`OUES, first ${Math.round(f.fraction * 100)} % of exercise`}
                m={f.slope}
                d={0}
                extra={bandNote(f, 0) || undefined}
              />
            ))}
            <IndexRow
              label="ΔVO2/ΔWR on the ramp"
              m={ix.dVo2dWr.whole.slope}
              d={1}
              extra={
                [ix.dVo2dWr.flattening ? "late flattening" : "", bandNote(ix.dVo2dWr.whole, 1)].filter(Boolean).join("; ") ||
                undefined
              }
            />
            <tr>
              <td>O2 pulse trajectory (last third of exercise)</td>
              <td className="num">
                {ix.o2Pulse.pattern ?? "—"}
                {record.patient.atrialFibrillation === true ? <div className="how">{ATRIAL_FIBRILLATION_HR_NOTE}</div> : null}
              </td>
              <td>
                <HowFound m={ix.o2Pulse.finalSlope} />
              </td>
            </tr>
            <IndexRow
              label={`Breathing reserve (${ix.breathingReserve.mvvLMin.provenance.label})`}
              m={ix.breathingReserve.reservePercent}
              d={0}
              extra={`${fmt(ix.breathingReserve.reserveLMin)} L/min; MVV ${fmt(ix.breathingReserve.mvvLMin)} L/min`}
            />
            <IndexRow label="VE/MVV at peak" m={ix.breathingReserve.veMvvPercent} d={0} />
            <IndexRow
              label="Heart-rate reserve"
              m={ix.heartRate.reserveBpm}
              d={0}
              unit={HR_UNIT}
              extra={
                [hrReserveNote(ix.heartRate.reserveBpm.value), ...heartRateNotes(record.patient)].filter(Boolean).join("; ") ||
                undefined
              }
            />
            <IndexRow
              label="Chronotropic index"
              m={ix.heartRate.chronotropicIndex}
              d={2}
              extra={heartRateNotes(record.patient).join("; ") || undefined}
            />
            <IndexRow
              label="HR recovery at 1 min"
              m={ix.heartRate.recovery1MinBpm}
              d={0}
              unit={HR_UNIT}
              extra={record.patient.atrialFibrillation === true ? ATRIAL_FIBRILLATION_HR_NOTE : undefined}
            />
            <IndexRow
              label="SpO2 at rest → lowest"
              m={ix.spo2.lowestPct}
              d={0}
              extra={`rest ${fmt(ix.spo2.restPct)} %, fall ${fmt(ix.spo2.fallPct, 1)} points`}
            />
            <IndexRow label="PETCO2 at rest" m={pk.petco2RestMmHg} d={1} />
            <IndexRow
              label="PETCO2 at VT1"
              m={pk.petco2AtVt1MmHg}
              d={1}
              extra={pk.petco2RiseMmHg.value !== null ? `rise from rest ${fmt(pk.petco2RiseMmHg, 1)} mmHg` : undefined}
            />
            {/* the rise that grades heart failure is the one from rest to VT1, given on the row above */}
            <IndexRow label="Highest PETCO2 during exercise" m={pk.petco2PeakMmHg} d={1} />
            {ix.eov.definitions.map((d) => (
              <tr key={d.id}>
                <td>Exercise oscillatory ventilation ({d.label})</td>
                <td className="num">
                  {d.detected === null ? "not assessable" : d.detected ? "present" : "absent"}
                  {d.detected && eovCarryOver !== null ? (
                    <small data-testid="eov-carry-over">
                      {" "}
                      (breath noise carries over, lag-1 correlation {formatNumber(eovCarryOver, 2)}: check the VE trace)
                    </small>
                  ) : null}
                </td>
                <td>
                  <HowFound m={d.detail} />
                </td>
              </tr>
            ))}
            {ix.vdVt.map((v) => (
              <IndexRow
                key={v.timeS}
                label={`VD/VT at ${v.label ?? formatClock(v.timeS)} (PaCO2 ${v.paCO2MmHg} mmHg)`}
                m={v.vdVt}
                d={2}
              />
            ))}
            {ix.vdVt
              .filter((v) => v.aaGradient)
              .map((v) => (
                <IndexRow
                  key={`aa-${v.timeS}`}
                  label={`P(A−a)O2 at ${v.label ?? formatClock(v.timeS)}`}
                  m={v.aaGradient!}
                  d={0}
                  unit="mmHg"
                />
              ))}
          </tbody>
        </table>
      </TableScroll>
      {[ix.veVco2.slopeToVt2, ix.veVco2.slopeWholeExercise, ix.dVo2dWr.whole, ...ix.oues.fits].some((l) => l.band) ? (
        <p data-testid="index-band-meaning">
          <small>{BAND_MEANING}</small>
        </p>
      ) : null}

      {ix.lactate ? (
        <>
          <h2>Lactate thresholds</h2>
          <TableScroll label="Lactate thresholds">
            <table className="label-value" data-testid="lactate">
              <tbody>
                {ix.lactate.thresholds.map((t) => (
                  <IndexRow
                    key={t.id}
                    label={t.intensity.provenance.label}
                    m={t.intensity}
                    d={ix.lactate?.axis === "speedKmh" ? 1 : 0}
                    extra={[
                      `lactate ${fmt(t.lactateMmolL, 1)} mmol/L`,
                      t.hrBpm?.value != null ? `heart rate ${fmt(t.hrBpm, 0)} ${HR_UNIT}` : "",
                      t.vo2MlMin?.value != null ? `VO2 ${fmt(t.vo2MlMin, 0)} mL/min` : "",
                      t.caution ? `caution: ${t.caution}` : "",
                    ]
                      .filter(Boolean)
                      .join("; ")}
                  />
                ))}
              </tbody>
            </table>
          </TableScroll>
          <ul>
            {ix.lactate.relations.map((r) => (
              <li key={r.id} data-reading={r.reading}>
                {r.statement}
              </li>
            ))}
          </ul>
        </>
      ) : null}

      <h2 id="domains">Intensity domains (for exercise prescription)</h2>
      <TableScroll label="Intensity domains">
        <table data-testid="domains">
          <thead>
            <tr>
              <th>Domain</th>
              <th className="num">Heart rate ({HR_UNIT})</th>
              <th className="num">Work rate on the ramp (W)</th>
              <th className="num">Work rate held at constant load (W)</th>
              <th className="num">Speed (km/h)</th>
              <th className="num">Grade (%)</th>
            </tr>
          </thead>
          <tbody>
            {ix.domains.domains.length === 0 ? (
              <tr data-testid="domains-none">
                <td colSpan={6}>
                  {/* with no domain, its issues are the reason (thresholds missing or out of order) */}
                  {ix.domains.issues.map((i) => i.message).join(" ") || "No domain can be given."}
                </td>
              </tr>
            ) : null}
            {ix.domains.domains.map((d) => (
              <tr key={d.id}>
                <td>{d.label}</td>
                <td className="num">{range(d.hrBpm.lower, d.hrBpm.upper, 0)}</td>
                <td className="num">{range(d.workW.lower, d.workW.upper, 0)}</td>
                <td className="num">{range(d.workConstantLoadW.lower, d.workConstantLoadW.upper, 0)}</td>
                <td className="num">{range(d.speedKmh.lower, d.speedKmh.upper, 1)}</td>
                <td className="num">{range(d.gradePct.lower, d.gradePct.upper, 1)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableScroll>
      <p className="how" data-testid="domains-lag">
        {ix.domains.lag.value !== null
          ? `VO2 lagged this ramp by about ${Math.round(ix.domains.lag.value)} s (its mean response time, fitted to the warm-up and the ramp below VT1; it may be off by ${RAMP_LAG_SPREAD_S} s); the work rate held at constant load is the ramp's work rate that long before each threshold, so it is approximate: set constant-load training by heart rate.`
          : `Constant-load work rates are not given: the VO2 lag on the ramp could not be measured (${ix.domains.lag.reason ?? "not measured"}).`}
      </p>

      <h2 id="interpretation">Interpretation path</h2>
      <ol data-testid="interpretation-path">
        {result.interpretation.path.steps.map((s) => (
          <li key={s.nodeId}>
            <strong>{s.title}:</strong> {s.text}
            {s.checks.map((c) => (
              <div key={c.ruleId} className="how">
                {c.text} <span className="tag">{EVIDENCE_LABEL[c.status]}</span>
              </div>
            ))}
          </li>
        ))}
      </ol>
      {result.interpretation.path.end ? (
        <p>
          <strong>End of path:</strong> {result.interpretation.path.end.label}
        </p>
      ) : null}

      <h2 id="patterns">Limitation patterns (ranked; never a single diagnosis)</h2>
      <TableScroll label="Limitation patterns">
        <table className="wide" data-testid="patterns" style={{ minWidth: "56rem" }}>
          <thead>
            <tr>
              <th>Pattern</th>
              <th>Support</th>
              <th>For</th>
              <th>Against</th>
            </tr>
          </thead>
          <tbody>
            {result.interpretation.patterns.map((pt) => (
              <tr key={pt.patternId}>
                <td>
                  {pt.statement}
                  {pt.supportNote ? <div className="how">{pt.supportNote}</div> : null}
                  {pt.borderline ? <div className="how">borderline: {pt.borderline}</div> : null}
                  <div className="how">evidence: {EVIDENCE_LABEL[pt.status]}</div>
                </td>
                <td className="nowrap">{pt.support.replace(/-/g, " ")}</td>
                <td className="how">{pt.for.map((f) => outcomeOf(f.text)).join("; ") || "—"}</td>
                <td className="how">{pt.against.map((f) => outcomeOf(f.text)).join("; ") || "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableScroll>

      <h2 id="schemes">Published schemes for this referral</h2>
      <div data-testid="schemes">
        {result.interpretation.schemes.map((s) => (
          <section key={s.schemeId} className="panel">
            <h3 style={{ marginTop: 0 }}>
              {s.name} <span className="tag">{EVIDENCE_LABEL[s.status]}</span>
            </h3>
            {s.overall ? (
              <p>
                <SeverityScale severity={s.overall.severity} steps={s.maxSeverity + 1} /> <strong>{s.overall.label}</strong>{" "}
                <span className="how">({s.overall.basis})</span>
              </p>
            ) : (
              <p className="how">
                {s.axes.some((a) => a.category)
                  ? "Graded variable by variable below (the scheme gives no combined category)."
                  : "No category: the inputs are missing or not assessable."}
              </p>
            )}
            <ul>
              {s.axes.map((a) => (
                <li key={a.axisId}>
                  {a.text}
                  {a.population ? <span className="how"> — {a.population}</span> : null}
                </li>
              ))}
              {s.path?.steps.map((st) => (
                <li key={st.nodeId}>{st.text}</li>
              ))}
            </ul>
            {s.notes.length > 0 ? <p className="how">{s.notes.join(" ")}</p> : null}
            <SourceList ids={s.sourceIds} />
          </section>
        ))}
      </div>

      <h2 id="quality">Data quality</h2>
      <IssueList issues={result.issues} />
      {result.issues.some((i) => i.code === "vo2-too-low-for-work" || i.code === "vo2-read-at-review") && (
        <Vo2CheckedForm
          testId={testId}
          signedInName={signedInName}
          versionToken={versionToken}
          checkedBy={result.issues.some((i) => i.code === "vo2-read-at-review") ? (settings.vo2Checked?.reason ?? null) : null}
        />
      )}
      <details>
        <summary>
          {setAsideCounts(result.conditioned.removed)}; phases:{" "}
          {result.conditioned.phases.map((ph) => `${ph.phase} ${formatClock(ph.startS)}–${formatClock(ph.endS)}`).join(", ")}
          {result.conditioned.rampRateWPerMin !== null ? `; ramp ${result.conditioned.rampRateWPerMin.toFixed(1)} W/min` : ""}
        </summary>
        <ul className="how">
          {result.conditioned.removed.slice(0, 200).map((r) => (
            <li key={`${r.index}-${r.field}`}>
              {formatClock(r.timeS)} {r.field in FIELD_LABEL ? shortFieldLabel(r.field as FieldKey) : "value"}{" "}
              {Number.isFinite(r.value) ? r.value.toFixed(1) : "—"}: {r.reason}
            </li>
          ))}
        </ul>
      </details>
      <ExerciseSpanForm
        testId={testId}
        signedInName={signedInName}
        versionToken={versionToken}
        current={
          result.conditioned.exercise
            ? { start: formatClock(result.conditioned.exercise.startS), end: formatClock(result.conditioned.exercise.endS) }
            : null
        }
        byReview={result.conditioned.phases.some((ph) => ph.source === "reviewer")}
      />
      <SetAsideForm
        testId={testId}
        signedInName={signedInName}
        versionToken={versionToken}
        spans={(result.conditioned.settings?.setAside ?? []).map((s) => ({
          label: `${s.channel === "heart-rate" ? "heart rate, " : ""}${formatClock(s.startS)}–${formatClock(s.endS)}: ${s.reason}`,
        }))}
      />
      <h3>How the file was read</h3>
      <ColumnTable columns={test.importColumns} />

      <h2 id="settings">Settings and versions</h2>
      <SettingsForm
        testId={testId}
        versionToken={versionToken}
        current={{
          averaging: avKey,
          peakWindowS: settings.peakWindowS ?? 30,
          vo2Equation: result.predicted.equationIds.vo2PeakMlMin ?? result.predicted.equationIds.vo2PeakMlKgMin ?? "",
          hrEquation: result.predicted.equationIds.hrMaxBpm ?? "",
          mvvChoice: settings.mvvChoice ?? "auto",
          choices: settings.interpret?.choices ?? {},
        }}
        vo2Equations={eqOptions(["vo2PeakMlMin", "vo2PeakMlKgMin"])}
        hrEquations={eqOptions(["hrMaxBpm"])}
        cutoffChoices={listCutoffChoices()}
      />
      <TableScroll label="Analysis versions">
        <table data-testid="versions">
          <thead>
            <tr>
              <th>Version</th>
              <th>When</th>
              <th>By</th>
              <th>Note</th>
            </tr>
          </thead>
          <tbody>
            {versions.map((v) => (
              <tr key={v.id}>
                <td className="num">{v.version}</td>
                <td className="nowrap">{v.createdAt.slice(0, 16).replace("T", " ")}</td>
                <td>{v.createdBy}</td>
                <td>{v.note}</td>
              </tr>
            ))}
            {versions.length === 0 ? (
              <tr>
                <td colSpan={4} className="how">
                  Lab default settings (no test-specific version saved yet).
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </TableScroll>
    </>
  );
}

/** The finding at the end of a rule's readable line ("Peak VO2 62 % … < 85 % → Peak VO2 reduced" → "Peak VO2 reduced"). */
function outcomeOf(text: string): string {
  return text.split(" → ").pop() ?? text;
}

/** A domain's range: "122 – 158", "up to 122" or "from 158" when one end is open, "—" when neither is known. */
function range(lower: Measured | null | undefined, upper: Measured | null | undefined, decimals: number): string {
  const lo = fmt(lower, decimals);
  const hi = fmt(upper, decimals);
  if (lo === "—" && hi === "—") return "—";
  if (lo === "—") return `up to ${hi}`;
  if (hi === "—") return `from ${lo}`;
  return `${lo} – ${hi}`;
}

function IndexRow({ label, m, d, extra, unit }: { label: string; m: Measured; d: number; extra?: string; unit?: string }) {
  return (
    <tr>
      <td>{label}</td>
      <td className="num">
        {fmt(m, d)} {m.value !== null ? (unit ?? displayUnit(m.unit)) : ""}
        {extra ? <div className="how">{extra}</div> : null}
      </td>
      <td>
        <HowFound m={m} />
      </td>
    </tr>
  );
}

function ThresholdCard({
  testId,
  t,
  at,
  title,
  predVo2,
  methodLabels,
  versionToken,
  signedInName,
}: {
  testId: number;
  versionToken: string;
  signedInName?: string;
  methodLabels: Record<string, string>;
  t: ThresholdEstimate;
  at: import("@/lib/thresholds").ValuesAtThreshold | null;
  title: string;
  predVo2: number | null;
}) {
  const which = t.which;
  return (
    <section className="panel" data-testid={`threshold-${which}`}>
      <h3 style={{ marginTop: 0 }}>{title}</h3>
      {t.vo2MlMin.value !== null ? (
        <>
          <div className="keyfig">
            {t.vo2MlMin.value.toFixed(0)} <small>mL/min</small>
          </div>
          <p>
            {[
              nb(fmt(at?.vo2MlKgMin, 1), "mL/kg/min"),
              nb(fmt(at?.vo2PercentPeak, 0), "% of peak"),
              ...(predVo2 ? [nb(((100 * t.vo2MlMin.value) / predVo2).toFixed(0), "% of predicted peak")] : []),
              `HR\u00a0${nb(fmt(at?.hrBpm), HR_UNIT)}`,
              nb(fmt(at?.workW), "W"),
              `at\u00a0${t.timeS !== null ? formatClock(t.timeS) : "—"}`,
            ].join(" · ")}
          </p>
          {t.overridden ? (
            <p data-testid={`set-by-${which}`}>
              Set by the reviewer ({t.overridden.by}): {t.overridden.reason}
            </p>
          ) : (
            <p>
              Confidence: <strong data-testid={`confidence-${which}`}>{t.confidence}</strong>
              {t.band ? (
                <>
                  {" "}
                  <span className="nowrap">
                    (band {t.band.lowMlMin.toFixed(0)}–{t.band.highMlMin.toFixed(0)} mL/min)
                  </span>
                </>
              ) : (
                ""
              )}
              {t.reason && t.confidence !== "high" ? (
                <>
                  <br />
                  <small data-testid={`confidence-reason-${which}`}>Why: {t.reason}</small>
                </>
              ) : null}
            </p>
          )}
        </>
      ) : (
        <NotDeterminable reason={t.reason ?? t.vo2MlMin.reason ?? ""} />
      )}
      {t.overridden ? (
        <div className="sev-warning" style={{ padding: "0.4rem" }}>
          {t.vo2MlMin.value === null
            ? `Set by the reviewer (${t.overridden.by}): ${t.overridden.reason}. `
            : "Reviewer override. "}
          {t.overridden.automatic.vo2MlMin !== null
            ? `Automatic estimate was ${formatNumber(t.overridden.automatic.vo2MlMin, 0)} mL/min (confidence ${t.overridden.automatic.confidence}).`
            : "The automatic estimate was not determinable."}
          <RemoveOverrideForm testId={testId} which={which} versionToken={versionToken} signedInName={signedInName} />
        </div>
      ) : null}
      <HowFound m={t.vo2MlMin} methodLabels={methodLabels} />
      <OverrideForm testId={testId} which={which} versionToken={versionToken} signedInName={signedInName} />
    </section>
  );
}

function ColumnTable({ columns }: { columns: import("@/lib/breath").ColumnDecision[] }) {
  return (
    <TableScroll label="How each column of the file was read">
      <table data-testid="column-decisions">
        <thead>
          <tr>
            <th>Column in file</th>
            <th>Read as</th>
            <th>Why</th>
          </tr>
        </thead>
        <tbody>
          {columns.map((c) => (
            <tr key={c.index}>
              <td>{c.header}</td>
              <td>{readAsShortText(c)}</td>
              <td className="how">{c.reason}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </TableScroll>
  );
}

/** "Not determinable" with its reason; the methods' reasons, joined by the engine, as a list. */
function NotDeterminable({ reason }: { reason: string }) {
  const parts = reason.split(METHOD_REASON_SEPARATOR).filter((p) => p.trim() !== "");
  if (parts.length < 2)
    return (
      <p>
        <strong>Not determinable.</strong> {reason.charAt(0).toUpperCase() + reason.slice(1)}
      </p>
    );
  return (
    <>
      <p>
        <strong>Not determinable.</strong> What each method found:
      </p>
      <ul className="compact-list">
        {parts.map((p, i) => (
          <li key={i}>{p}</li>
        ))}
      </ul>
    </>
  );
}

/**
 * "3 breath value(s) set aside by artefact rejection and 25 by review": the automatic screens and the reviewer's spans
 * (marked `byReview`) counted apart.
 */
function setAsideCounts(removed: readonly { byReview?: boolean }[]): string {
  const byReview = removed.filter((r) => r.byReview).length;
  const automatic = removed.length - byReview;
  return `${automatic} breath value(s) set aside by artefact rejection${byReview ? ` and ${byReview} by review` : ""}`;
}

/** A % predicted, in brackets with the reason beside it when the interpretation does not read it. */
function PctPredicted({ pct, notRead, testId }: { pct: number | null; notRead?: string; testId: string }) {
  const shown = pct === null ? "—" : notRead ? `(${pct.toFixed(0)} %)` : `${pct.toFixed(0)} %`;
  return (
    <>
      {shown}
      {notRead ? (
        <div className="how" data-testid={testId}>
          not read: {notRead}
        </div>
      ) : null}
    </>
  );
}
