// What the page asks, in the service's field names (src/http/schemas/buildings.ts, surveys.ts, sizing.ts).
// A field's `path` is its place in the request body, so a 400's errors[].path finds the field it names, and the
// body is built from the paths alone. `fold` puts a field in a folded "more" part; `when` shows it only for some
// answers; `required` (true or a function of the values) makes an empty field an error.

import { ctRatio, ctRatioOf, impedancePct, kvar, METHODS, pf, rules, spectrum, spectrumOf, steps, stepsOf, thd, volts } from "./checks.js";

const money = (key, label) => ({ path: key, label, check: rules.money(key.split(".").pop()), inputmode: "decimal" });

/** Systems an electrician meets most; the last choice lets them type another. Line-to-line on three-phase. */
export const COMMON_SYSTEMS = [
  { id: "400-3-50", label: "400 V three-phase, 50 Hz", voltageV: 400, frequencyHz: 50, phases: 3 },
  { id: "415-3-50", label: "415 V three-phase, 50 Hz", voltageV: 415, frequencyHz: 50, phases: 3 },
  { id: "690-3-50", label: "690 V three-phase, 50 Hz", voltageV: 690, frequencyHz: 50, phases: 3 },
  { id: "230-1-50", label: "230 V single-phase, 50 Hz", voltageV: 230, frequencyHz: 50, phases: 1 },
  { id: "208-3-60", label: "208 V three-phase, 60 Hz", voltageV: 208, frequencyHz: 60, phases: 3 },
  { id: "480-3-60", label: "480 V three-phase, 60 Hz", voltageV: 480, frequencyHz: 60, phases: 3 },
  { id: "600-3-60", label: "600 V three-phase, 60 Hz", voltageV: 600, frequencyHz: 60, phases: 3 },
  { id: "240-1-60", label: "240 V single-phase, 60 Hz", voltageV: 240, frequencyHz: 60, phases: 1 },
];

const tariffIs = (form) => (v) => v["economics.tariff.form"] === form;
const any =
  (...paths) =>
  (v) =>
    paths.some((p) => String(v[p] ?? "").trim() !== "");

/** The new-building form, in sections; folded sections hold what a simple survey can skip. */
export const BUILDING_SECTIONS = [
  {
    title: "",
    fields: [
      { path: "name", label: "Name", check: rules.text("name", 200), required: true, wide: true },
      {
        path: "address",
        label: "Address (optional)",
        check: (r) => (String(r).length > 500 ? "address must be at most 500 characters" : ""),
        wide: true,
      },
    ],
  },
  {
    title: "",
    fields: [
      {
        path: "_system",
        label: "System",
        kind: "select",
        wide: true,
        required: true,
        requiredMessage: "pick the system, or Other and type it",
        options: [["", "— pick the system —"], ...COMMON_SYSTEMS.map((s) => [s.id, s.label]), ["other", "Other: type it below"]],
      },
      {
        path: "system.voltageV",
        label: "Voltage (V, line-to-line)",
        check: volts,
        inputmode: "decimal",
        required: true,
        when: (v) => v._system === "other",
      },
      {
        path: "system.frequencyHz",
        label: "Frequency",
        kind: "select",
        parse: "number",
        options: [
          ["", "—"],
          ["50", "50 Hz"],
          ["60", "60 Hz"],
        ],
        required: true,
        when: (v) => v._system === "other",
      },
      {
        path: "system.phases",
        label: "Phases",
        kind: "select",
        parse: "number",
        options: [
          ["", "—"],
          ["3", "three-phase"],
          ["1", "single-phase"],
        ],
        required: true,
        when: (v) => v._system === "other",
      },
    ],
  },
  {
    title: "Transformer and utility (for the resonance screen)",
    fold: true,
    fields: [
      {
        path: "transformer.kVA",
        label: "Transformer kVA",
        check: rules.positive("kVA"),
        inputmode: "decimal",
        required: any("transformer.impedancePct", "transformer.xOverR"),
      },
      {
        path: "transformer.impedancePct",
        label: "Impedance (%)",
        inputmode: "decimal",
        required: any("transformer.kVA", "transformer.xOverR"),
        check: impedancePct,
      },
      {
        path: "transformer.xOverR",
        label: "X/R (optional)",
        inputmode: "decimal",
        check: rules.range("xOverR", 0, 100, "xOverR must be greater than 0 and at most 100", { minExclusive: true }),
      },
      { path: "utility.faultMVA", label: "Utility fault level (MVA)", inputmode: "decimal", check: rules.positive("faultMVA") },
    ],
  },
  {
    title: "Tariff and costs (for savings and payback)",
    fold: true,
    fields: [
      {
        path: "economics.tariff.form",
        label: "Tariff",
        kind: "select",
        wide: true,
        options: [
          ["", "— no tariff —"],
          ["kva_demand", "Charge per kVA of demand"],
          ["kw_demand_pf_adjusted", "kW demand raised below a base PF"],
          ["kvarh_excess", "Charge per kvarh above an allowance"],
          ["none", "No reactive charge (losses only)"],
        ],
      },
      {
        path: "economics.currency",
        label: "Currency (ISO code)",
        required: (v) => !!v["economics.tariff.form"],
        when: (v) => !!v["economics.tariff.form"],
        check: rules.pattern(/^[A-Z]{3}$/, "currency must be an ISO 4217 code such as USD or EUR"),
      },
      { ...money("economics.tariff.chargePerKVA", "Charge per kVA a month"), required: true, when: tariffIs("kva_demand") },
      { ...money("economics.tariff.chargePerKW", "Charge per billed kW a month"), required: true, when: tariffIs("kw_demand_pf_adjusted") },
      {
        path: "economics.tariff.basePF",
        label: "Base PF",
        inputmode: "decimal",
        required: true,
        when: tariffIs("kw_demand_pf_adjusted"),
        check: rules.range("basePF", 0.7, 1, "basePF must be 0.70 to 1.00"),
      },
      { ...money("economics.tariff.chargePerKvarh", "Charge per kvarh"), required: true, when: tariffIs("kvarh_excess") },
      {
        path: "economics.tariff.allowanceRatio",
        label: "kvarh allowed per kWh",
        inputmode: "decimal",
        required: true,
        when: tariffIs("kvarh_excess"),
        check: rules.range("allowanceRatio", 0, 2, "allowanceRatio must be 0 to 2"),
      },
      {
        path: "economics.operatingHoursPerMonth",
        label: "Operating hours a month",
        inputmode: "decimal",
        when: (v) => !!v["economics.tariff.form"],
        check: rules.range("operatingHoursPerMonth", 0, 744, "a month has at most 744 hours", { minExclusive: true }),
      },
      {
        path: "economics.losses.lossesPct",
        label: "Losses (% of kWh)",
        inputmode: "decimal",
        when: (v) => !!v["economics.tariff.form"],
        required: any("economics.losses.energyPricePerKWh"),
        check: rules.range("lossesPct", 0, 20, "lossesPct must be 0 to 20 %"),
      },
      {
        ...money("economics.losses.energyPricePerKWh", "Energy price per kWh"),
        when: (v) => !!v["economics.tariff.form"],
        required: any("economics.losses.lossesPct"),
      },
      { ...money("economics.cost.perKvar", "Bank cost per kvar"), when: (v) => !!v["economics.tariff.form"] },
      { ...money("economics.cost.perStep", "Cost per step"), when: (v) => !!v["economics.tariff.form"] },
      { ...money("economics.cost.fixed", "Fixed cost"), when: (v) => !!v["economics.tariff.form"] },
    ],
  },
];

/**
 * One installed bank's fields under `at` ("installedBanks.1"): where it is, how it is switched, its nameplate.
 * The steps are typed as the nameplates read ("5 × 50"); a fixed bank is one step, as the service requires.
 */
export function installedBankFields(at) {
  const is = (f, value) => (v) => v[`${at}.${f}`] === value;
  return [
    { path: `${at}.label`, label: "Label (as on the panel)", check: rules.text("label", 100), required: true },
    {
      path: `${at}.location`,
      label: "Connected at",
      kind: "select",
      wide: true,
      options: [
        ["service", "The service (main switchboard)"],
        ["group", "A group: MCC or feeder"],
        ["motor", "A motor's terminals"],
      ],
    },
    {
      path: `${at}.group`,
      label: "Group (MCC or feeder)",
      check: rules.text("group", 100),
      required: true,
      when: is("location", "group"),
      requiredMessage: "a group bank needs the group (MCC or feeder) it corrects",
    },
    {
      path: `${at}.loadLabel`,
      label: "Motor (its load label)",
      check: rules.text("loadLabel", 200),
      required: true,
      when: is("location", "motor"),
      requiredMessage: "a motor-terminal bank needs the loadLabel of its motor",
    },
    {
      path: `${at}.control`,
      label: "Control",
      kind: "select",
      options: [
        ["automatic", "Automatic (switched steps)"],
        ["fixed", "Fixed (always on)"],
      ],
      wide: true,
    },
    {
      path: `${at}.steps`,
      label: "Steps, nameplate kvar",
      placeholder: "5 × 50",
      required: true,
      requiredMessage: "a bank needs at least one step",
      parse: stepsOf,
      check: (raw) => steps(raw),
      wide: true,
    },
    { path: `${at}.ratedVoltageV`, label: "Rated voltage (V)", check: volts, inputmode: "decimal", required: true },
    {
      path: `${at}.reactorPct`,
      label: "Reactor (%), 0 if none",
      inputmode: "decimal",
      check: rules.range("reactorPct", 0, 20, "reactorPct must be 0 to 20 %"),
    },
    {
      path: `${at}.ratedFrequencyHz`,
      label: "Rated frequency",
      kind: "select",
      parse: "number",
      options: [
        ["", "as the system"],
        ["50", "50 Hz"],
        ["60", "60 Hz"],
      ],
    },
    {
      path: `${at}.connection`,
      label: "Connection",
      kind: "select",
      options: [
        ["", "not known"],
        ["delta", "delta"],
        ["wye", "wye (star)"],
      ],
    },
    {
      path: `${at}.installedOn`,
      label: "Installed on (optional)",
      kind: "date",
      check: rules.pattern(/^\d{4}-\d{2}-\d{2}$/, "installedOn must be an ISO 8601 date such as 2021-06-30"),
    },
  ];
}

/** A fixed bank is one step (the service's rule, installedBankIssues in src/core/bank/installed.ts). */
export function fixedBankIssue(values, at) {
  const s = stepsOf(values[`${at}.steps`]);
  return values[`${at}.control`] === "fixed" && Array.isArray(s) && s.length > 1 ? "a fixed bank is one step: give its total kvar as one step" : "";
}

/** The method choices, worded as the meter shows the readings. */
export const METHOD_OPTIONS = [
  ["kw_pf", "kW and PF"],
  ["kw_kva", "kW and kVA"],
  ["kw_kvar", "kW and kvar"],
  ["v_i_kw", "Volts, amps and kW"],
  ["v_i_pf", "Volts, amps and PF"],
];

const READING = {
  kW: { label: "kW", check: rules.positive("kW") },
  kVA: { label: "kVA", check: rules.positive("kVA") },
  kvar: { label: "kvar (+ lagging, − leading)", check: kvar },
  volts: { label: "Volts (line-to-line)", check: volts, voltsHint: true },
  amps: { label: "Amps", check: rules.positive("amps") },
  pf: { label: "PF", check: pf },
  sense: {
    label: "Sense",
    kind: "select",
    options: [
      ["lagging", "lagging"],
      ["leading", "leading"],
      ["unity", "unity"],
    ],
  },
};

/**
 * The fields of one reading under `at` ("loads.0.measurement", "serviceEntrance.measurement"): the method, its
 * readings, then the meter's PF type and current THD (folded with `foldExtras`).
 */
export function readingFields(at, method, { optional = false, foldExtras = false } = {}) {
  const methodField = {
    path: `${at}.method`,
    label: "Measured as",
    kind: "select",
    wide: true,
    options: optional ? [["", "— not read —"], ...METHOD_OPTIONS] : METHOD_OPTIONS,
  };
  const readings = (METHODS[method] ?? []).map((f) => ({
    path: `${at}.${f}`,
    ...(f === "sense" ? {} : { inputmode: "decimal", required: true }),
    ...READING[f],
  }));
  const extras = method
    ? [
        {
          path: `${at}.pfType`,
          label: "Meter PF is",
          kind: "select",
          fold: foldExtras,
          options: [
            ["displacement", "displacement (fundamental)"],
            ["true", "true (with harmonics)"],
          ],
        },
        {
          path: `${at}.currentTHDPct`,
          label: "Current THD (%)",
          inputmode: "decimal",
          fold: foldExtras,
          check: thd,
          when: (v) => v[`${at}.pfType`] === "true",
        },
      ]
    : [];
  return [methodField, ...readings, ...extras];
}

/** One load's fields under `at` ("loads.3"); the folded ones describe the load beyond its reading. */
export function loadFields(at, load) {
  return [
    { path: `${at}.label`, label: "Label", check: rules.text("label", 200), required: true },
    {
      path: `${at}.kind`,
      label: "Kind",
      kind: "select",
      options: [
        ["motor", "Motor"],
        ["drive", "Drive"],
        ["lighting", "Lighting"],
        ["hvac", "HVAC"],
        ["welder", "Welder"],
        ["other", "Other"],
      ],
    },
    { path: `${at}.quantity`, label: "Quantity", inputmode: "numeric", check: rules.whole("quantity", 1, 10_000) },
    ...readingFields(`${at}.measurement`, load[`${at}.measurement.method`], { foldExtras: true }),
    {
      path: `${at}.phases`,
      label: "Phases",
      kind: "select",
      parse: "number",
      fold: true,
      options: [
        ["", "as the building"],
        ["3", "three-phase"],
        ["1", "single-phase"],
      ],
    },
    {
      path: `${at}.starting`,
      label: "Starting method",
      kind: "select",
      fold: true,
      options: [
        ["", "— not a motor / unknown —"],
        ["across_the_line", "Across the line (DOL)"],
        ["star_delta", "Star-delta"],
        ["soft_starter", "Soft starter"],
        ["reduced_voltage", "Reduced voltage"],
        ["jogging", "Jogging"],
        ["plugging", "Plugging"],
        ["reversing", "Reversing"],
        ["multi_speed", "Multi-speed"],
      ],
    },
    { path: `${at}.separateCapacitorContactor`, label: "Own capacitor contactor", kind: "check", fold: true, when: (v) => !!v[`${at}.starting`] },
    { path: `${at}.noLoadAmps`, label: "No-load amps (one motor)", inputmode: "decimal", fold: true, check: rules.positive("noLoadAmps") },
    { path: `${at}.group`, label: "Group (MCC or feeder)", fold: true, check: rules.text("group", 100) },
    { path: `${at}.continuousDuty`, label: "Continuous duty", kind: "check", fold: true },
    { path: `${at}.harmonics`, label: "Current harmonics (order:%)", fold: true, check: spectrum, placeholder: "5:30, 7:12", parse: spectrumOf },
  ];
}

/** The survey's own fields, outside the loads. */
export const SURVEY_FIELDS = [
  { path: "surveyor", label: "Surveyor", check: rules.text("surveyor", 200), required: true, autocomplete: "name" },
  {
    path: "surveyedAt",
    label: "Date of readings",
    kind: "date",
    required: true,
    requiredMessage: "surveyedAt must be a date",
    check: rules.pattern(/^\d{4}-\d{2}-\d{2}$/, "surveyedAt must be a date"),
  },
  {
    path: "targetPF",
    label: "Target PF",
    inputmode: "decimal",
    required: true,
    check: rules.range("targetPF", 0.8, 1, "targetPF must be between 0.8 and 1"),
  },
  {
    path: "scope",
    label: "The readings cover",
    kind: "select",
    wide: true,
    options: [
      ["", "Decide from the readings: whole site if the main is read"],
      ["whole_site", "The whole site (every load behind the main)"],
      ["partial", "Part of the site (some loads or one board)"],
    ],
    note: "Whole site: the bank is sized for the building's total. Part: only the loads listed; interval data then does not size the central bank.",
  },
];

/** Folded survey parts: the main readings and the bank's controller CT. */
export function surveyExtraFields(values) {
  return [
    {
      title: "Service entrance reading",
      fields: [
        ...readingFields("serviceEntrance.measurement", values["serviceEntrance.measurement.method"], { optional: true }),
        {
          path: "serviceEntrance.label",
          label: "Where (optional)",
          when: (v) => !!v["serviceEntrance.measurement.method"],
          check: (r) => (String(r).length > 200 ? "label must be at most 200 characters" : ""),
        },
      ],
    },
    {
      title: "Light-load reading at the main",
      fields: [
        ...readingFields("lightLoad.measurement", values["lightLoad.measurement.method"], { optional: true }),
        {
          path: "lightLoad.label",
          label: "When (optional)",
          when: (v) => !!v["lightLoad.measurement.method"],
          check: (r) => (String(r).length > 200 ? "label must be at most 200 characters" : ""),
        },
      ],
    },
    {
      title: "Controller CT",
      fields: [{ path: "bankDesign.ctRatio", label: "CT ratio (e.g. 1000/5)", check: ctRatio, placeholder: "1000/5", parse: ctRatioOf }],
    },
  ];
}
