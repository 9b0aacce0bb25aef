/** Parameter and text pieces several specs share. */
import { DEFAULT_PRESSURE_PA, DEFAULT_TEMPERATURE_C } from "../calc/_lib/constants";
import { waterDensity, waterKinematicViscosity } from "../calc/water";
import type { QuantityParam, TableParam, UnitParam } from "./types";

/** A value computed on first use and kept (for defaults that never change). */
function once(compute: () => number): () => number {
  let value: number | undefined;
  return () => (value ??= compute());
}

/** The optional result unit, always named `unit`. */
export function unitParam(example: string) {
  return { name: "unit", kind: "unit", optional: true, description: `Unit of the result, such as ${example}; base unit when left out.` } as const satisfies UnitParam;
}

const DEFAULT_WATER_NOTE = "water at 20 °C and 101.325 kPa (IAPWS-IF97 and IAPWS 2008)";

export const densityParam = {
  name: "density",
  kind: "quantity",
  dim: "density",
  optional: true,
  description: "Liquid density; water at 20 °C when left out.",
  default: once(() => waterDensity(DEFAULT_TEMPERATURE_C, DEFAULT_PRESSURE_PA).value),
  defaultNote: DEFAULT_WATER_NOTE,
} as const satisfies QuantityParam;

export const kinematicViscosityParam = {
  name: "kinematic_viscosity",
  kind: "quantity",
  dim: "kinematicViscosity",
  optional: true,
  description: "Liquid kinematic viscosity; water at 20 °C when left out.",
  default: once(() => waterKinematicViscosity(DEFAULT_TEMPERATURE_C, DEFAULT_PRESSURE_PA).value),
  defaultNote: DEFAULT_WATER_NOTE,
} as const satisfies QuantityParam;

export const flowParam = { name: "flow", kind: "quantity", dim: "flow", description: "Volume flow rate." } as const satisfies QuantityParam;
export const diameterParam = { name: "diameter", kind: "quantity", dim: "length", description: "Pipe inside diameter.", plausible: [1e-4, 10] } as const satisfies QuantityParam;

/** Shown with every result that sizes a pump or a pipe, and first of the general cautions. */
export const DESIGN_AID =
  "A design aid for preliminary sizing: confirm with the pump maker's certified data, local codes and a licensed engineer.";

/** The cautions every view keeps in sight (pane footer, audits, reports, the demo): written once, here. */
export const GENERAL_CAUTIONS = [DESIGN_AID, "Pressurised systems, surge, cavitation, motors and public water features can hurt people."] as const;
export const PRESSURE_CAUTION =
  "Pressurised piping can fail violently; test pressures, relief and surge protection follow local codes and the pipe maker's ratings.";
export const CAVITATION_CAUTION =
  "Cavitation destroys impellers and can cause sudden loss of flow; keep a margin over NPSHr as the pump maker and ANSI/HI 9.6.1 advise.";
export const JET_CAUTION =
  "Jets and water features in public places can injure people and spread waterborne disease; follow local codes for public water features.";

/** A pump curve table argument, shared by the pump and affinity functions. */
export const curveParam = {
  name: "curve",
  kind: "table",
  table: "curve",
  description: 'Pump curve range at the curve\'s impeller and speed: Flow, Head and optionally Eff, NPSHr, Power columns; a header such as "Flow (gpm)" sets each column\'s unit.',
} as const satisfies TableParam;

/** Invented example curve on the parabola H = 52 − 12000·Q² (m, m³/s), for hand-checkable examples. */
export const PARABOLA_CURVE = [0, 0.01, 0.02, 0.03, 0.04, 0.05].map((q) => [q, 52 - 12000 * q * q]);

/** Invented test curve (US units) for the examples of the pump functions: not any maker's pump. */
export const EXAMPLE_CURVE_US = [
  ["Flow (gpm)", "Head (ft)", "Eff (%)", "NPSHr (ft)"],
  [0, 100, 0, ""],
  [100, 98, 55, 6],
  [200, 92, 72, 8],
  [300, 80, 76, 11],
  [400, 60, 70, 16],
];
