import { listCutoffChoices } from "@/lib/interpret";
import { DEFAULT_LAB_SETTINGS, EQUATIONS, LAB_QUANTITIES, PREDICTED_QUANTITIES, sameConcept } from "@/lib/predicted";
import { getLabDefaults, labDefaultsToken } from "@/lib/store/labSettings";
import { LabForm } from "./LabForm";
import { pageAccess } from "../access";

export const dynamic = "force-dynamic";

/** The lab's choices, named in every result and report: equations per quantity and ergometer, disputed cut-offs. */
export default async function LabSettingsPage() {
  await pageAccess("/lab");
  const current = getLabDefaults();
  const eqs = current.labSettings?.equations ?? {};
  const quantities = LAB_QUANTITIES.map((q) => {
    const options = (erg: "cycle" | "treadmill") =>
      EQUATIONS.filter(
        (e) => sameConcept(e.quantity, q) && e.kind !== "performance-estimate" && (e.ergometer === "both" || e.ergometer === erg),
      ).map((e) => ({
        id: e.id,
        label: `${e.label} (${e.status})`,
      }));
    return { id: q, label: PREDICTED_QUANTITIES[q].label, options: { cycle: options("cycle"), treadmill: options("treadmill") } };
  });
  const equations: Record<string, Record<string, string | undefined>> = {};
  for (const q of LAB_QUANTITIES) {
    equations[q] = {
      cycle: eqs[q]?.cycle ?? DEFAULT_LAB_SETTINGS.equations[q]?.cycle,
      treadmill: eqs[q]?.treadmill ?? DEFAULT_LAB_SETTINGS.equations[q]?.treadmill,
    };
  }
  return (
    <>
      <h1>Lab settings</h1>
      <p className="how">
        The defaults every new analysis starts from. The equation and cut-off used are named beside every result and in every
        report. A reviewer can still change them for one test; that is saved as a new analysis version of that test.
      </p>
      <LabForm
        quantities={quantities}
        current={{ equations, choices: current.interpret?.choices ?? {}, peakWindowS: current.peakWindowS ?? 30 }}
        cutoffChoices={listCutoffChoices()}
        labToken={labDefaultsToken()}
      />
    </>
  );
}
