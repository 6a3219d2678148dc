import { INTERPRETATION_DATA, type InterpretationData } from "./interpretationData";
import type { CutoffChoice } from "./types";

/**
 * The cut-off choices a lab can make where published sources disagree (choices.json), each with its
 * documented default and every option's sources and evidence status. Pass `{ [choice.id]: option.id }`
 * as `InterpretSettings.choices`.
 */
export function listCutoffChoices(data: InterpretationData = INTERPRETATION_DATA): CutoffChoice[] {
  return data.choices.map((c) => ({
    id: c.id,
    label: c.label,
    description: c.description,
    defaultOptionId: c.default,
    options: c.options.map((o) => ({
      id: o.id,
      label: o.label,
      sourceIds: o.sourceIds,
      status: o.status,
      ...(o.note ? { note: o.note } : {}),
    })),
  }));
}
