import { ok } from "../calc/_lib/result";
import { systemCurve, systemHead } from "../calc/systemCurve";
import { DESIGN_AID, PRESSURE_CAUTION, kinematicViscosityParam, unitParam } from "./_shared";
import { segmentsFromTable, spillHeader, spillValue } from "./_tables";
import { defineSpec, type FunctionSpec, type TableParam } from "./types";

const segmentsParam = {
  name: "segments",
  kind: "table",
  table: "segments",
  description: 'Pipe segments range: Length, ID, Roughness and optionally K (sum of fitting coefficients) per row; a header such as "ID (in)" sets units.',
} as const satisfies TableParam;
const staticHead = { name: "static_head", kind: "quantity", dim: "length", description: "Static head: elevation rise plus any pressure difference as head." } as const;
const EQUATION = String.raw`H(Q) = H_s + \sum_i \Big(f_i\,\frac{L_i}{D_i} + \Sigma K_i\Big)\frac{V_i^2}{2g}, \quad V_i = \frac{4Q}{\pi D_i^2}`;
const ASSUMPTIONS = ["Segments in series carry the whole flow.", "Friction factor by Colebrook per segment (64/Re when laminar); K values refer to each segment's own velocity."];
const SOURCES = ["Darcy–Weisbach with Colebrook (1939)", "Loss-coefficient method (Crane Technical Paper 410)"];
/** Invented two-segment system used in the examples. */
const SEGMENTS = [
  ["Length (m)", "ID (mm)", "Roughness (mm)", "K"],
  [12, 154.1, 0.045, 2.5],
  [180, 102.3, 0.045, 6],
];

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "SYSTEM.HEAD",
    topic: "systemCurve",
    purpose: "Head a piping system needs at a flow: static head plus friction and fitting losses of each segment.",
    params: [{ name: "flow", kind: "quantity", dim: "flow", description: "Flow through the system." }, staticHead, segmentsParam, kinematicViscosityParam, unitParam('"ft" or "m"')],
    result: { dim: "length", description: "System head, m." },
    equation: EQUATION,
    derivation: (n) => `H = H_s + Σh = ${n.step("H_s")} + ${n.step("Σh")} = ${n.result}`,
    assumptions: ASSUMPTIONS,
    validity: ["Transitional flow or roughness beyond the Moody chart in any segment warns."],
    cautions: [DESIGN_AID, PRESSURE_CAUTION],
    sources: SOURCES,
    examples: [
      {
        args: [0.02, 15, SEGMENTS, 1.004e-6],
        expect: 26.67714238287764,
        tolerance: 1e-10,
        source: "Colebrook solved with mpmath per segment, h = (fL/D + K)·V²/2g summed in Python (independent calculation)",
      },
    ],
    compute: (a) => {
      const segments = segmentsFromTable("segments", a.segments);
      return systemHead(a.flow, a.static_head, { segments, kinematicViscosity: a.kinematic_viscosity });
    },
  }),
  defineSpec({
    id: "SYSTEM.CURVE",
    topic: "systemCurve",
    purpose: "System curve from zero to a maximum flow; spills a table of flow and head with a unit header.",
    params: [
      staticHead,
      segmentsParam,
      { name: "max_flow", kind: "quantity", dim: "flow", description: "Largest flow of the curve." },
      { name: "points", kind: "quantity", dim: "ratio", optional: true, default: 11, defaultNote: "11 points", description: "Number of points, 2 to 1000; 11 when left out." },
      kinematicViscosityParam,
      { name: "flow_unit", kind: "unit", optional: true, description: 'Unit of the flow column, such as "gpm"; m³/s when left out.' },
      { name: "head_unit", kind: "unit", optional: true, description: 'Unit of the head column, such as "ft"; m when left out.' },
    ],
    result: { dim: "length", description: 'Header row ("Flow (gpm)", "Head (ft)") then one row per point, ready to use as a table argument.', spill: true },
    equation: EQUATION,
    derivation: (n) => `H(Q) = H_s + Σh(Q): ${n.step("H_s")} at zero flow to ${n.step("H(Q_max)")} at ${n.arg("max_flow")}`,
    assumptions: ASSUMPTIONS,
    validity: ["Points a whole number from 2 to 1000."],
    cautions: [DESIGN_AID],
    sources: SOURCES,
    examples: [
      {
        args: [15, [[0, 0.1, 0, 1]], 0.01, 2],
        expect: [["Flow (m^3/s)", "Head (m)"], [0, 15], [0.01, 15 + (0.01 / (Math.PI * 0.0025)) ** 2 / (2 * 9.80665)]],
        source: "Definition: static head at zero flow; one velocity head (K = 1, no pipe length) at 0.01 m³/s in 0.1 m",
      },
    ],
    compute: (a) => {
      const segments = segmentsFromTable("segments", a.segments);
      const curve = systemCurve(a.static_head, { segments, kinematicViscosity: a.kinematic_viscosity }, a.max_flow, a.points);
      const fu = a.flow_unit;
      const hu = a.head_unit;
      const rows = curve.value.map(([q, h]) => [spillValue("flow_unit", q, "flow", fu), spillValue("head_unit", h, "length", hu)]);
      return ok([[spillHeader("Flow", fu, "flow"), spillHeader("Head", hu, "length")], ...rows], curve.warnings, curve.steps);
    },
  }),
];
