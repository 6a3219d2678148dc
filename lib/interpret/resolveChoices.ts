import { makeIssue, type Issue } from "../core";
import type { ChoiceOption } from "./evaluateCondition";
import type { InterpretationData } from "./interpretationData";
import type { InterpretSettings, SettingUsed } from "./types";

export interface ResolvedChoices {
  options: Record<string, ChoiceOption>;
  settingsUsed: SettingUsed[];
  issues: Issue[];
}

/**
 * Resolve the lab's cut-off choices against choices.json: each choice takes the option named in
 * `settings.choices` or its documented default. An unknown choice or option is a settings problem
 * returned as an issue (the default is then used), not an exception.
 */
export function resolveChoices(data: InterpretationData, settings: InterpretSettings = {}): ResolvedChoices {
  const requested = settings.choices ?? {};
  const issues: Issue[] = [];
  for (const id of Object.keys(requested)) {
    if (!data.choiceById.has(id)) {
      issues.push(
        makeIssue(
          "warning",
          "unknown-cutoff-choice",
          `The setting names a cut-off choice "${id}" that does not exist; it was ignored.`,
          { field: `choices.${id}` },
        ),
      );
    }
  }
  const options: Record<string, ChoiceOption> = {};
  const settingsUsed: SettingUsed[] = [];
  for (const c of data.choices) {
    let optionId = requested[c.id] ?? c.default;
    let opt = c.options.find((o) => o.id === optionId);
    if (!opt) {
      issues.push(
        makeIssue(
          "warning",
          "unknown-cutoff-option",
          `"${optionId}" is not an option of "${c.label}"; the default "${c.default}" was used.`,
          { field: `choices.${c.id}` },
        ),
      );
      optionId = c.default;
      opt = c.options.find((o) => o.id === optionId)!;
    }
    options[c.id] = opt;
    settingsUsed.push({
      choiceId: c.id,
      label: c.label,
      optionId: opt.id,
      optionLabel: opt.label,
      isDefault: opt.id === c.default,
      sourceIds: opt.sourceIds,
      status: opt.status,
    });
  }
  return { options, settingsUsed, issues };
}
