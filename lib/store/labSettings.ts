import "server-only";
import type { AnalysisSettings } from "../analysis";
import { getDb } from "./db";
import { audit } from "./tests";

/** The lab's default settings ({} = the engine's documented defaults). */
export function getLabDefaults(): AnalysisSettings {
  const row = getDb().prepare("select settings_json from lab_settings where id = 1").get() as
    { settings_json: string } | undefined;
  return row ? (JSON.parse(row.settings_json) as AnalysisSettings) : {};
}

/**
 * Which version of the lab defaults a page showed (the time of the last save, or "never"): the lab form sends it back, so
 * a save from a page opened before another save is refused instead of silently undoing it.
 */
export function labDefaultsToken(): string {
  const row = getDb().prepare("select updated_at from lab_settings where id = 1").get() as { updated_at: string } | undefined;
  return row?.updated_at ?? "never";
}

export function saveLabDefaults(settings: AnalysisSettings, actor: string): void {
  getDb()
    .prepare(
      "insert into lab_settings (id, settings_json, updated_by, updated_at) values (1, ?, ?, ?) on conflict(id) do update set settings_json = excluded.settings_json, updated_by = excluded.updated_by, updated_at = excluded.updated_at",
    )
    .run(JSON.stringify(settings), actor, new Date().toISOString());
  audit(actor, "lab-settings-changed", null, JSON.stringify(settings));
}
