import Link from "next/link";
import { notFound } from "next/navigation";
import { PLAUSIBLE_LIMITS } from "@/lib/core";
import { getUploadDetails } from "@/lib/store/reimport";
import { getTest, listAnalysisVersions } from "@/lib/store/tests";
import { recordToken } from "../recordToken";
import { LabelForm } from "./LabelForm";
import { CopyForm } from "./CopyForm";
import { ANONYMISED_COPY_FREE_TEXT, ANONYMISED_COPY_REMOVES } from "@/lib/store/anonymisedCopy";
import { PatientForm, type PatientFormProps } from "./PatientForm";
import { pageAccess } from "../../../access";
import { auditTestViewed } from "@/lib/store/reports";

export const dynamic = "force-dynamic";

const text = (x: number | undefined) => (x === undefined ? "" : String(x));

/** Correct the patient and test details of a test after import. */
export default async function PatientPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const access = await pageAccess(`/tests/${id}/patient`);
  const testId = Number(id);
  if (!Number.isInteger(testId) || testId <= 0) notFound();
  const test = getTest(testId);
  if (!test) notFound();
  auditTestViewed(access.actor, testId, "patient");
  const refused = !test.record;
  const kept = refused ? getUploadDetails(testId) : null;
  const source = test.record ?? kept;
  const p = source?.patient ?? {};
  const current: PatientFormProps["current"] = {
    sex: p.sex ?? "",
    ageY: text(p.ageY),
    heightCm: text(p.heightCm),
    weightKg: text(p.weightKg),
    ergometer: source?.ergometer ?? "cycle",
    referral: source?.referral ?? "general",
  };
  const versions = refused ? [] : listAnalysisVersions(testId);
  const limits = (["ageY", "heightCm", "weightKg"] as const).map((k) => PLAUSIBLE_LIMITS[k]);
  return (
    <>
      <h1 data-testid="patient-title">Patient and test details — {test.label}</h1>
      <p className="row">
        <Link href={`/tests/${testId}`}>{refused ? "← back to the refused test" : "← back to the analysis"}</Link>
        <Link href={`/tests/${testId}/columns`}>How the file was read</Link>
        {!refused ? <Link href={`/tests/${testId}/inputs`}>Lactate, gases, spirometry, context</Link> : null}
      </p>
      <p className="how">
        Predicted values, percentages of predicted and the interpretation depend on these details.{" "}
        {refused
          ? "This test's file is not usable yet: the details are kept and used when the file is read successfully."
          : `Saving a change creates a new analysis version (now ${versions[0] ? `version ${versions[0].version}` : "lab defaults, no version yet"}); earlier versions stay listed, and the breath data, lactate, gases, spirometry and context of the record are kept.`}{" "}
        Accepted ranges: {limits.map((l) => `${l.label} ${l.min}–${l.max}`).join(", ")}. Leave a field empty when it is not known.
      </p>
      <section className="panel">
        <PatientForm
          testId={testId}
          current={current}
          perKg={test.record?.table.vo2PerKg === true}
          recordToken={recordToken(test)}
        />
      </section>
      <section className="panel">
        <LabelForm testId={testId} label={test.label} />
      </section>
      {!refused ? (
        <>
          <h2>Anonymised copy for teaching</h2>
          <section className="panel">
            <CopyForm testId={testId} removes={ANONYMISED_COPY_REMOVES} freeText={ANONYMISED_COPY_FREE_TEXT} />
          </section>
        </>
      ) : null}
    </>
  );
}
