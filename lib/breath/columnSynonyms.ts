import type { NumericField } from "./types";

/**
 * Header spellings recognised for each quantity. A header is lower-cased, stripped of accents,
 * apostrophes and dots ("V'O2", "V.O2" → "vo2"), of its unit (in brackets or trailing tokens such as
 * "_ml_min") and of qualifiers (STPD, BTPS, abs); what is left is looked up here.
 * To add a spelling, add it (normalised: lower case letters and digits only) to the right list.
 */
export interface SynonymEntry {
  field: NumericField | "phase";
  names: readonly string[];
  /** Unit implied by the name itself (e.g. "vo2kg" → mL/kg/min). */
  impliedUnit?: string;
}

export const COLUMN_SYNONYMS: readonly SynonymEntry[] = [
  {
    field: "timeS",
    names: [
      "time",
      "t",
      "times",
      "zeit",
      "tiempo",
      "temps",
      "tempo",
      "elapsed",
      "elapsedtime",
      "testtime",
      "timeelapsed",
      "runtime",
      "tijd",
      "clock",
      "clocktime",
      "timeofday",
      "uhrzeit",
    ],
  },
  { field: "vo2MlMin", names: ["vo2", "oxygenuptake", "o2uptake", "vo2uptake", "oxygenconsumption", "o2consumption"] },
  {
    field: "vo2MlMin",
    names: ["vo2kg", "vo2perkg", "vo2rel", "relvo2", "vo2relative", "relativevo2", "vo2bw"],
    impliedUnit: "ml/kg/min",
  },
  { field: "vco2MlMin", names: ["vco2", "co2output", "co2production", "carbondioxideoutput", "vco2output"] },
  { field: "veLMin", names: ["ve", "ventilation", "minuteventilation", "vmin", "minutevolume", "vemin"] },
  { field: "hrBpm", names: ["hr", "heartrate", "pulse", "puls", "hf", "pulserate", "heartfrequency", "fc"] },
  // heart periods (R–R, NN or inter-beat intervals, ms): read as heart rate through 60 000 / R–R
  {
    field: "hrBpm",
    names: ["rrinterval", "rri", "rrms", "nninterval", "nn", "ibi", "interbeatinterval", "heartperiod"],
    impliedUnit: "ms",
  },
  {
    field: "workW",
    names: [
      "load",
      "power",
      "watts",
      "watt",
      "wr",
      "work",
      "workrate",
      "workload",
      "w",
      "ergload",
      "ergometerload",
      "pow",
      // German, Dutch, Spanish, French, Italian exports
      "last",
      "belastung",
      "leistung",
      "belasting",
      "vermogen",
      "carga",
      "potencia",
      "charge",
      "puissance",
      "carico",
      "potenza",
    ],
  },
  {
    field: "speedKmh",
    names: [
      "speed",
      "velocity",
      "beltspeed",
      "treadmillspeed",
      "runningspeed",
      "geschwindigkeit",
      "vitesse",
      "velocidad",
      "velocita",
      "snelheid",
    ],
  },
  {
    field: "gradePct",
    names: [
      "grade",
      "incline",
      "slope",
      "gradient",
      "elevation",
      "inclination",
      "steigung",
      "pente",
      "pendiente",
      "inclinazione",
      "helling",
    ],
  },
  {
    field: "rrBrMin",
    names: [
      "rr",
      "bf",
      "rf",
      "fr",
      "fb",
      "respiratoryrate",
      "breathingfrequency",
      "breathingrate",
      "respirationrate",
      "breathrate",
      "resprate",
      "freq",
      "frequency",
      "br",
    ],
  },
  { field: "vtL", names: ["vt", "tv", "tidalvolume", "vtidal", "tidal"] },
  { field: "peto2MmHg", names: ["peto2", "eto2", "etpo2", "endtidalo2", "endtidalpo2", "peto2mmhg"] },
  { field: "petco2MmHg", names: ["petco2", "etco2", "etpco2", "endtidalco2", "endtidalpco2"] },
  { field: "spo2Pct", names: ["spo2", "o2sat", "sat", "saturation", "oxygensaturation", "spo2pct"] },
  { field: "phase", names: ["phase", "marker", "markers", "event", "events", "phasename", "segment", "period", "label"] },
  { field: "stage", names: ["stage", "step", "level", "stageindex", "stagenumber", "stageno", "stagenr", "stufe", "etape"] },
  { field: "lactateMmolL", names: ["lactate", "la", "lac", "bla", "lactat", "bloodlactate", "blac", "lactic"] },
];

/** Headers that name a test or patient: several distinct values mean several records in one file. */
export const RECORD_ID_NAMES: readonly string[] = [
  "id",
  "subject",
  "subjectid",
  "patient",
  "patientid",
  "test",
  "testid",
  "file",
  "record",
  "recordid",
  "athlete",
  "participant",
  "timepoint",
  "visit",
  "occasion",
  "session",
];

/** Headers that give body mass (used to convert VO2 per kg when constant over the record). */
export const BODY_MASS_NAMES: readonly string[] = ["weight", "bodymass", "mass", "bodyweight", "bw"];

/** Derived quantities recomputed by the engine, so their columns are not imported. */
export const DERIVED_NAMES: readonly string[] = [
  "rer",
  "rq",
  "vevo2",
  "vevco2",
  "eqo2",
  "eqco2",
  "o2pulse",
  "vo2hr",
  "o2hr",
  "fio2",
  "feo2",
  "feco2",
  "fetco2",
  "feto2",
  "vo2max",
  "hrmax",
];

/**
 * End-tidal gas fractions (%): not partial pressures, and turning one into PETCO2/PETO2 needs the barometric pressure
 * (PET = FET × (PB − 47 mmHg), common practice), which exports rarely give; they are named as not used.
 */
export const END_TIDAL_FRACTION_NAMES: readonly string[] = ["fetco2", "feto2"];

/** Qualifier tokens dropped before lookup. */
export const QUALIFIER_TOKENS: readonly string[] = [
  "stpd",
  "btps",
  "atps",
  "abs",
  "absolute",
  "measured",
  "meas",
  "raw",
  "value",
];
