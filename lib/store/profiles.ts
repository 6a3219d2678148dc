import "server-only";
import { columnMappingSchema, mappingProfileSchema, type ColumnMapping, type MappingProfile } from "../breath";
import { getDb } from "./db";
import { audit } from "./tests";

/** A saved mapping profile with its row id and creation time (ISO 8601, UTC). */
export interface StoredProfile extends MappingProfile {
  id: number;
  createdAt: string;
}

/** Result of `saveProfile`: the saved profile, or why it was not saved (never throws on user input). */
export type SaveProfileResult =
  { ok: true; profile: StoredProfile } | { ok: false; reason: "invalid" | "name-taken" | "empty"; message: string };

interface ProfileRow {
  id: number;
  name: string;
  mapping_json: string;
  created_at: string;
}

function fromRow(r: ProfileRow): StoredProfile | null {
  let raw: unknown;
  try {
    raw = JSON.parse(r.mapping_json);
  } catch {
    return null;
  }
  const mapping = columnMappingSchema.safeParse(raw);
  return mapping.success ? { id: r.id, name: r.name, mapping: mapping.data, createdAt: r.created_at } : null;
}

/** Every saved profile whose stored mapping is still valid, by name (case-insensitive order). */
export function listProfiles(): StoredProfile[] {
  const rows = getDb()
    .prepare("select id, name, mapping_json, created_at from mapping_profiles order by name collate nocase, id")
    .all() as ProfileRow[];
  return rows.map(fromRow).filter((p): p is StoredProfile => p !== null);
}

/** One profile by its exact name (surrounding spaces ignored); null when there is none or it is unreadable. */
export function getProfile(name: string): StoredProfile | null {
  const row = getDb()
    .prepare("select id, name, mapping_json, created_at from mapping_profiles where name = ?")
    .get(name.trim()) as ProfileRow | undefined;
  return row ? fromRow(row) : null;
}

/**
 * Save a new named profile. The profile is validated with `mappingProfileSchema` (lib/breath); names are
 * unique regardless of letter case (the stored name is trimmed), a taken name or an empty mapping is refused with a plain message.
 */
export function saveProfile(profile: MappingProfile, actor = "local user"): SaveProfileResult {
  const parsed = mappingProfileSchema.safeParse(profile);
  if (!parsed.success) return { ok: false, reason: "invalid", message: "The profile needs a name and a valid column mapping." };
  const { name, mapping } = parsed.data as { name: string; mapping: ColumnMapping };
  if (Object.keys(mapping).length === 0)
    return {
      ok: false,
      reason: "empty",
      message: "There is nothing to save: every column is read automatically. Change at least one column first.",
    };
  if (getDb().prepare("select 1 from mapping_profiles where name = ? collate nocase").get(name))
    return {
      ok: false,
      reason: "name-taken",
      message: `A profile named "${name}" already exists. Choose another name, or delete the old profile on the profiles page.`,
    };
  const createdAt = new Date().toISOString();
  const info = getDb()
    .prepare("insert into mapping_profiles (name, mapping_json, created_at) values (?, ?, ?)")
    .run(name, JSON.stringify(mapping), createdAt);
  audit(actor, "mapping-profile-saved", null, `${name}: ${Object.keys(mapping).length} column(s)`);
  return { ok: true, profile: { id: Number(info.lastInsertRowid), name, mapping, createdAt } };
}

/** Delete a profile by name; true when one was deleted. Tests already imported with it keep their decisions. */
export function deleteProfile(name: string, actor = "local user"): boolean {
  const info = getDb().prepare("delete from mapping_profiles where name = ?").run(name.trim());
  if (info.changes > 0) audit(actor, "mapping-profile-deleted", null, name.trim());
  return info.changes > 0;
}
