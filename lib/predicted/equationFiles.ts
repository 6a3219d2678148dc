/**
 * Index of every reference-equation data file. Static JSON imports keep `lib/` pure (no file
 * reading) and let Next and the CLI bundle the data. Adding an equation = adding its file here;
 * a test fails when a file in `reference-equations/` is missing from this list.
 */
import ers2019HrmaxCycle from "../../reference-equations/ers-2019-hrmax-cycle.json";
import ers2019HrmaxTreadmill from "../../reference-equations/ers-2019-hrmax-treadmill.json";
import friend2017 from "../../reference-equations/friend-2017.json";
import friend2018 from "../../reference-equations/friend-2018.json";
import friendErgometry2018 from "../../reference-equations/friend-ergometry-2018.json";
import hansen1984 from "../../reference-equations/hansen-1984.json";
import hrmax220Age from "../../reference-equations/hrmax-220-age.json";
import jones1985Hrmax from "../../reference-equations/jones-1985-hrmax.json";
import jones1985O2pulse from "../../reference-equations/jones-1985-o2pulse.json";
import jones1985Wmax from "../../reference-equations/jones-1985-wmax.json";
import jones1985 from "../../reference-equations/jones-1985.json";
import mvvFev1x35 from "../../reference-equations/mvv-fev1x35.json";
import mvvFev1x40 from "../../reference-equations/mvv-fev1x40.json";
import o2pulseDerived from "../../reference-equations/o2pulse-derived.json";
import sun2002 from "../../reference-equations/sun-2002.json";
import tanaka2001 from "../../reference-equations/tanaka-2001.json";

/** Raw (unvalidated) data files, in a stable order. Validate with `ReferenceEquationSchema` before use. */
export const EQUATION_FILES: readonly unknown[] = [
  ers2019HrmaxCycle,
  ers2019HrmaxTreadmill,
  friend2017,
  friend2018,
  friendErgometry2018,
  hansen1984,
  hrmax220Age,
  jones1985Hrmax,
  jones1985O2pulse,
  jones1985Wmax,
  jones1985,
  mvvFev1x35,
  mvvFev1x40,
  o2pulseDerived,
  sun2002,
  tanaka2001,
];
