"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import type { AnalysisSettings } from "@/lib/analysis";
import { LabSettingsSchema } from "@/lib/predicted";
import { getLabDefaults, labDefaultsToken, saveLabDefaults } from "@/lib/store/labSettings";
import { SESSION_NEEDED, currentAccess } from "../access";

export interface LabFormState {
  ok?: string;
  errors?: Record<string, string>;
  /** When the answer was made (`useKeptForm` starts again from each answer). */
  stamp?: number;
}

const formSchema = z.object({
  by: z.string().trim().min(2, "Say who is changing the lab settings").max(80),
  peakWindowS: z.coerce.number().refine((n) => [15, 20, 30, 60].includes(n), "Peak window must be 15, 20, 30 or 60 s"),
});

/** Save the lab's defaults: equation per quantity and ergometer, disputed cut-offs, peak window. */
export async function saveLab(_prev: LabFormState, form: FormData): Promise<LabFormState> {
  const values: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === "string") values[k] = v;
  const access = await currentAccess();
  if (!access) return { stamp: Date.now(), errors: { form: SESSION_NEEDED } };
  // signed in, the change is the account's (the audit names it too)
  if (access.mode === "account") values.by = access.account.displayName;
  const parsed = formSchema.safeParse(values);
  if (!parsed.success)
    return { stamp: Date.now(), errors: Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])) };
  if (values.labToken !== labDefaultsToken())
    return {
      stamp: Date.now(),
      errors: {
        form:
          "Not saved: the lab defaults were changed elsewhere (another tab or another person) after this page was opened, " +
          "and saving now would undo that change. Note your choices, reload the page to see the current defaults, and " +
          "make your change again.",
      },
    };
  const equations: Record<string, Record<string, string>> = {};
  const choices: Record<string, string> = {};
  for (const [k, v] of Object.entries(values)) {
    const eq = /^eq:([A-Za-z0-9]+):(cycle|treadmill)$/.exec(k);
    if (eq && v) (equations[eq[1]] ??= {})[eq[2]] = v;
    if (k.startsWith("choice:") && v) choices[k.slice(7)] = v;
  }
  const lab = LabSettingsSchema.safeParse({ equations });
  if (!lab.success) return { stamp: Date.now(), errors: { equations: "An equation choice is not valid for its quantity." } };
  const settings: AnalysisSettings = {
    ...getLabDefaults(),
    labSettings: lab.data,
    interpret: { choices },
    peakWindowS: parsed.data.peakWindowS,
  };
  saveLabDefaults(settings, parsed.data.by);
  revalidatePath("/lab");
  return {
    stamp: Date.now(),
    ok: "Lab defaults saved. Tests without a test-specific version now use them; saved versions are unchanged.",
  };
}
