/**
 * A file that names its exercise mode (a "sport" column) is checked against the ergometer chosen. Real data: Donne B,
 * Fleming N, Campbell G, Ward T, Crampton D, Mahony N. Graded Incremental Test Data (Cycling, Running, Kayaking, Rowing):
 * an open access dataset, v2, Zenodo 2024, doi:10.5281/zenodo.10841412 (CC BY 4.0; stage tables extracted to CSV by
 * B. Cai, see tests/fixtures/open-data/tcd-graded-tests/README.md).
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { buildRecord } from "../../lib/analysis";

const bytes = new Uint8Array(
  fs.readFileSync(path.resolve(__dirname, "../fixtures/open-data/tcd-graded-tests/graded_tests_tidy.csv")),
);
const read = (file: string, ergometer: "cycle" | "treadmill") =>
  buildRecord({
    bytes,
    fileName: "graded_tests_tidy.csv",
    patient: { sex: "female", ageY: 29, heightCm: 170, weightKg: 65 },
    ergometer,
    importOptions: { select: { file }, stageDurationS: 180 },
  });
const warning = (r: Awaited<ReturnType<typeof read>>) => r.issues.find((i) => i.code === "exercise-mode-mismatch");

describe("the exercise mode the file names against the ergometer chosen", () => {
  it("a rowing test read as cycle ergometry is warned about; a cycling test is not", async () => {
    const rowing = await read("A1121.xlsx", "cycle");
    expect(warning(rowing)?.message).toMatch(
      /^The file's column "sport" says Rowing \(rowing\)\. If the test was done on that ergometer, this software has predicted values and cut-offs for cycle ergometry and treadmill tests only.* If the column names the athlete's sport, this does not apply\.$/,
    );
    expect(rowing.columns.find((c) => c.header === "sport")?.reason).toBe("names the exercise mode (Rowing); not a measurement");
    expect(warning(await read("A1080.xlsx", "cycle"))).toBeUndefined();
  });

  it("a running test read as cycle ergometry is asked whether to change the ergometer; read as a treadmill test it is not", async () => {
    expect(warning(await read("A100.xlsx", "cycle"))?.message).toMatch(
      /says Running \(running or walking\), but the test is analysed as cycle ergometry: if the test was done that way, change the ergometer/,
    );
    expect(warning(await read("A100.xlsx", "treadmill"))).toBeUndefined();
  });
});
