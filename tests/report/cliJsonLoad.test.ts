/**
 * What the command-line JSON says about the load and the patient beside the file: treadmill speed at the thresholds, the
 * peak and in the domains; an ergometer that contradicts the file's load columns; a body mass the file states otherwise;
 * a reason beside every heart-rate value left empty. Inputs are INVENTED: a treadmill test of the audit model
 * (lib/synthetic, truth known by construction) and the normal-adult demo case (tests/fixtures/cases).
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { analyse, buildRecord } from "../../lib/analysis";
import type { Ergometer } from "../../lib/core";
import { CLINICAL_CAUTION, toCliJson } from "../../lib/report";
import { auditSpec, breathTableToCsv, generateAuditTest } from "../../lib/synthetic";

const schema = z.fromJSONSchema(JSON.parse(fs.readFileSync(path.resolve(__dirname, "../../cli/analyse.schema.json"), "utf8")));
const patient = { sex: "male" as const, ageY: 45, heightCm: 178, weightKg: 75 };

async function cliJson(csv: string, ergometer: Ergometer, weightKg = 75) {
  const built = await buildRecord({
    bytes: new TextEncoder().encode(csv),
    fileName: "test.csv",
    patient: { ...patient, weightKg },
    ergometer,
    importOptions: { weightKg },
  });
  return toCliJson(analyse(built.record!, { bootstrap: 0 }), CLINICAL_CAUTION);
}

/** The first treadmill test of the audit model (INVENTED), as a plain CSV. */
function treadmillTest() {
  for (let i = 0; i < 60; i++) {
    const spec = auditSpec(i, 41, ["low"]);
    if (spec.protocol.ergometer !== "treadmill") continue;
    const syn = generateAuditTest(spec, 41 + i);
    return { csv: breathTableToCsv(syn.table), table: syn.table };
  }
  throw new Error("no treadmill test in the first 60 audit specs");
}

describe("treadmill tests in the JSON (INVENTED audit-model test)", () => {
  const { csv, table } = treadmillTest();
  const speeds = table.rows.map((r) => r.speedKmh).filter((v): v is number => typeof v === "number");

  it("speed at the peak, at VT1 and VT2 and over the domains, inside the protocol's speeds and in order", async () => {
    const json = await cliJson(csv, "treadmill");
    expect(schema.safeParse(json).success).toBe(true);
    // by construction the highest speed of the protocol is the highest in the file
    expect(json.peak.speedKmh).toBeCloseTo(Math.max(...speeds), 6);
    expect(json.peak.workW).toBeNull();
    expect(json.issues.some((i) => i.message.startsWith("Peak work rate"))).toBe(false);
    for (const t of [json.vt1, json.vt2])
      if (t.vo2MlMin !== null) {
        expect(t.speedKmh!).toBeGreaterThanOrEqual(Math.min(...speeds));
        expect(t.speedKmh!).toBeLessThanOrEqual(Math.max(...speeds));
      }
    if (json.vt1.speedKmh != null && json.vt2.speedKmh != null) expect(json.vt1.speedKmh).toBeLessThanOrEqual(json.vt2.speedKmh);
    const bounds = json.domains.flatMap((d) => d.speedKmh ?? []).filter((v): v is number => v !== null);
    expect(bounds.length).toBeGreaterThan(0);
    for (let k = 1; k < bounds.length; k++) expect(bounds[k]).toBeGreaterThanOrEqual(bounds[k - 1]);
    expect(json.issues.some((i) => i.code === "ergometer-differs-from-file")).toBe(false);
  }, 60_000);

  it("the same file set as a cycle test: a warning that names the treadmill", async () => {
    const json = await cliJson(csv, "cycle");
    const w = json.issues.find((i) => i.code === "ergometer-differs-from-file");
    expect(w?.severity).toBe("warning");
    expect(w?.message).toContain("treadmill speed and no work rate");
  }, 60_000);
});

describe("the demo case's file against what is entered (INVENTED normal-adult demo)", () => {
  const csv = fs.readFileSync(path.resolve(__dirname, "../fixtures/cases/normal-adult.csv"), "utf8");

  it("a cycle file set as a treadmill test is warned; as a cycle test it is not", async () => {
    expect((await cliJson(csv, "treadmill")).issues.map((i) => i.code)).toContain("ergometer-differs-from-file");
    expect((await cliJson(csv, "cycle")).issues.map((i) => i.code)).not.toContain("ergometer-differs-from-file");
  }, 60_000);

  it("a body mass in the file's details lines that differs from the one entered is named", async () => {
    const withDetails = `Weight,70,kg\n${csv}`;
    const json = await cliJson(withDetails, "cycle", 75);
    const w = json.issues.find((i) => i.code === "weight-differs-from-file");
    expect(w?.message).toMatch(/states a body mass of 70(\.0)? kg; the 75(\.0)? kg entered is used/);
    expect((await cliJson(withDetails, "cycle", 70)).issues.map((i) => i.code)).not.toContain("weight-differs-from-file");
  }, 60_000);

  it("without recovery rows, HR recovery is null with its reason in the issues", async () => {
    const lines = csv.trim().split("\n");
    const noRecovery = lines.filter((l) => !l.endsWith(",recovery")).join("\n") + "\n";
    expect(noRecovery.length).toBeLessThan(csv.length);
    const json = await cliJson(noRecovery, "cycle");
    expect(json.heartRate.recovery1MinBpm).toBeNull();
    expect(
      json.issues.some(
        (i) =>
          i.code === "not-determinable" &&
          i.message.startsWith("HR recovery at 1 min:") &&
          i.where?.field === "heartRate.recovery1MinBpm",
      ),
    ).toBe(true);
  }, 60_000);

  it("every stable key given as null has a not-determinable issue whose where.field names that key", async () => {
    // the heart-rate and work-rate columns and the recovery rows taken out of the file: peak HR, HR reserve, peak work
    // rate, ΔVO2/ΔWR and HR recovery cannot be determined; no FEV1 or MVV: breathing reserve neither
    const lines = csv.trim().split("\n");
    const comments = lines.filter((l) => l.startsWith("#"));
    const [head, ...rows] = lines.filter((l) => !l.startsWith("#") && !l.endsWith(",recovery"));
    const cols = head.split(",");
    const keep = cols.map((c, k) => (/^(hr|heart|work|load|watt)/i.test(c) ? -1 : k)).filter((k) => k >= 0);
    expect(keep.length).toBe(cols.length - 2);
    const table = [head, ...rows].map((l) => keep.map((k) => l.split(",")[k]).join(","));
    const stripped = [...comments, ...table].join("\n") + "\n";
    const json = await cliJson(stripped, "cycle");
    const pick = (key: string) => key.split(".").reduce<unknown>((o, k) => (o as Record<string, unknown> | null)?.[k], json);
    const stable = [
      "peak.vo2MlMin",
      "peak.vo2MlKgMin",
      "peak.rer",
      "peak.hrBpm",
      "peak.workW",
      "vt1.vo2MlMin",
      "vt2.vo2MlMin",
      "veVco2Slope.toRcp",
      "veVco2Slope.whole",
      "oues",
      "dVo2dWr",
      "breathingReserve.pct",
      "heartRate.reserveBpm",
      "heartRate.recovery1MinBpm",
    ];
    const nulls = stable.filter((k) => pick(k) === null);
    // by construction of the stripped file these four are missing (a test that finds none would prove nothing)
    expect(nulls).toEqual(
      expect.arrayContaining(["peak.hrBpm", "peak.workW", "dVo2dWr", "breathingReserve.pct", "heartRate.recovery1MinBpm"]),
    );
    for (const k of nulls) {
      const why = json.issues.filter((i) => i.code === "not-determinable" && i.where?.field === k);
      expect(why, k).toHaveLength(1);
      expect(why[0].message.length, k).toBeGreaterThan(10);
    }
  }, 60_000);
});
