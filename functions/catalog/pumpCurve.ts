import { CURVE_FITS, curveInterpolant, valueAt } from "../calc/pumpCurve";
import { operatingPoint } from "../calc/operatingPoint";
import { checkSystem, systemHead, systemHeadAt } from "../calc/systemCurve";
import { combineFactors, pumpPowerAt, selectImpeller } from "../calc/pumpSelection";
import { curveScaleFactors } from "../calc/affinity";
import { dutyAgainstBep } from "../calc/envelope";
import { ok, type StepDimension } from "../calc/_lib/result";
import type { Table } from "../tables/table";
import { CAVITATION_CAUTION, curveParam, DESIGN_AID, densityParam, EXAMPLE_CURVE_US, PARABOLA_CURVE, flowParam, kinematicViscosityParam, unitParam } from "./_shared";
import { curveFromTable, impellersFromTable, spillHeader, spillTable, spillValue, systemLosses } from "./_tables";
import { defineSpec, type ChoiceParam, type FunctionSpec, type UnitParam } from "./types";

const fitParam = {
  name: "fit",
  kind: "choice",
  options: CURVE_FITS,
  optional: true,
  default: "pchip",
  defaultNote: "pchip, the monotone cubic through the points",
  description: '"pchip" (default: monotone cubic through the points), "quadratic" or "cubic" (least squares).',
} as const satisfies ChoiceParam;
const flowUnit = { name: "flow_unit", kind: "unit", optional: true, description: 'Unit of the spilled flow, such as "gpm"; m³/s when left out.' } as const satisfies UnitParam;
const headUnit = { name: "head_unit", kind: "unit", optional: true, description: 'Unit of the spilled head, such as "ft"; m when left out.' } as const satisfies UnitParam;

const PCHIP_SOURCE =
  "Fritsch, F. N. and Carlson, R. E. (1980), SIAM J. Numer. Anal. 17(2), 238–246; Fritsch and Butland (1984); as SLATEC PCHIM, MATLAB pchip and SciPy PchipInterpolator";
const PCHIP_EQUATION = String.raw`H(Q) = h_{00}(t)H_k + h_{10}(t)\Delta_k d_k + h_{01}(t)H_{k+1} + h_{11}(t)\Delta_k d_{k+1},\ \ \frac{w_1 + w_2}{d_k} = \frac{w_1}{\delta_{k-1}} + \frac{w_2}{\delta_k}`;
const CURVE_ASSUMPTIONS = [
  "The curve is the maker's curve for the pumped liquid at the curve's speed and impeller.",
  "Between points: monotone piecewise cubic Hermite (PCHIP) unless a least-squares fit is asked for; no value outside the curve's flow range.",
];
const SCIPY = "SciPy PchipInterpolator, test/reference/curve_reference.py";

const CURVE_US = EXAMPLE_CURVE_US;

const curveOf = (curve: Table) => curveFromTable("curve", curve);

/** Reads one column of a curve at the flow, with the interpolation's steps. */
function readColumn(a: { flow: number; curve: Table; fit: (typeof CURVE_FITS)[number] }, column: "head" | "efficiency" | "npshr", symbol: string, dim: StepDimension) {
  const f = curveInterpolant("curve", curveOf(a.curve), column, a.fit);
  return ok(valueAt("flow", column === "npshr" ? "NPSHr" : column, f, a.flow), [], f.steps(a.flow, symbol, dim));
}

/** The derivation of a value read from a curve: PCHIP between the two points either side (with the straight line beside it), or the fitted polynomial. */
const curveDerivation = (symbol: string) => (n: Parameters<NonNullable<FunctionSpec["derivation"]>>[0]) =>
  n.has("t")
    ? `${symbol}(Q) = h00(t)·${symbol}_k + h10(t)·ΔQ·d_k + h01(t)·${symbol}_k+1 + h11(t)·ΔQ·d_k+1 with t = ${n.step("t")} between (${n.step("Q_k")}, ${n.step(`${symbol}_k`)}) and (${n.step("Q_k+1")}, ${n.step(`${symbol}_k+1`)}): ${symbol} = ${n.result}; the straight line gives ${n.step(`${symbol} (straight line)`)}`
    : `${symbol}(s) = Σ c_i·s^i at s = ${n.step("s")}: ${symbol} = ${n.result}`;

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "PUMP.HEAD",
    topic: "pumpCurve",
    purpose: "Head of a pump at a flow, read from its curve.",
    params: [flowParam, curveParam, unitParam('"ft" or "m"'), fitParam],
    result: { dim: "length", description: "Head, m." },
    equation: PCHIP_EQUATION,
    derivation: curveDerivation("H"),
    assumptions: CURVE_ASSUMPTIONS,
    validity: ["At least 3 points, no repeated flow; head may rise to one peak and then must fall; flows outside the curve are an error."],
    cautions: [DESIGN_AID],
    sources: [PCHIP_SOURCE],
    examples: [{ args: ["250 gpm", CURVE_US, "ft"], expect: 86.875, tolerance: 1e-12, source: `${SCIPY}: 86.875 ft` }],
    compute: (a) => readColumn(a, "head", "H", "length"),
  }),
  defineSpec({
    id: "PUMP.EFFICIENCY",
    topic: "pumpCurve",
    purpose: "Efficiency of a pump at a flow, read from its curve's efficiency column.",
    params: [flowParam, curveParam, fitParam],
    result: { dim: "ratio", description: "Efficiency as a fraction (0.76)." },
    equation: PCHIP_EQUATION,
    derivation: curveDerivation("η"),
    assumptions: [...CURVE_ASSUMPTIONS, 'An efficiency column headed "Eff (%)" is read as percent; without "%" it must hold fractions.'],
    validity: ["Efficiencies from 0 to 1 (or 0 to 100 %)."],
    cautions: [DESIGN_AID],
    sources: [PCHIP_SOURCE],
    examples: [{ args: ["250 gpm", CURVE_US], expect: 0.748095238095238, tolerance: 1e-12, source: `${SCIPY}` }],
    compute: (a) => readColumn(a, "efficiency", "η", "efficiency"),
  }),
  defineSpec({
    id: "PUMP.NPSHR",
    topic: "pumpCurve",
    purpose: "NPSH required by a pump at a flow, read from its curve's NPSHr column.",
    params: [flowParam, curveParam, unitParam('"ft" or "m"'), fitParam],
    result: { dim: "length", description: "NPSHr, m." },
    equation: PCHIP_EQUATION,
    derivation: curveDerivation("NPSHr"),
    assumptions: [...CURVE_ASSUMPTIONS, "NPSHr is the maker's NPSH3 (3 % head drop)."],
    validity: ["Blank NPSHr cells are skipped; at least 3 points must remain."],
    cautions: [CAVITATION_CAUTION],
    sources: [PCHIP_SOURCE],
    examples: [{ args: ["250 gpm", CURVE_US, "ft"], expect: 9.33125, tolerance: 1e-12, source: `${SCIPY} (blank NPSHr at shutoff skipped): 9.33125 ft` }],
    compute: (a) => readColumn(a, "npshr", "NPSHr", "length"),
  }),
  defineSpec({
    id: "PUMP.POWER",
    topic: "pumpCurve",
    purpose: "Shaft power of a pump at a flow: from the curve's power column, or ρgQH/η from its head and efficiency.",
    params: [flowParam, curveParam, densityParam, unitParam('"kW" or "hp"')],
    result: { dim: "power", description: "Shaft power, W." },
    equation: String.raw`P = \frac{\rho\, g\, Q\, H(Q)}{\eta(Q)} \quad \text{or} \quad P = P(Q) \text{ from the power column}`,
    derivation: (n) => (n.has("P_h") ? `P = ρgQH/η = ${n.arg("density")}·${n.g}·${n.arg("flow")}·${n.step("H(Q)")}/${n.step("η(Q)")} = ${n.result}` : curveDerivation("P")(n)),
    assumptions: [...CURVE_ASSUMPTIONS, "A power column is used as given (it is for the maker's test liquid); otherwise power is computed with the given density."],
    validity: ["Needs a power column, or head and efficiency columns; efficiency above zero at the flow."],
    cautions: [DESIGN_AID, "Size the motor for the largest power on the curve, not only at the duty point."],
    sources: ["Definition of pump input power (ANSI/HI 1.6)", PCHIP_SOURCE],
    examples: [
      {
        args: ["250 gpm", CURVE_US, 1000, "hp"],
        expect: (1000 * 9.80665 * 250 * (3.785411784e-3 / 60) * 86.875 * 0.3048) / 0.748095238095238 / 745.69987158227022,
        tolerance: 1e-9,
        source: "ρgQH/η with the SciPy PCHIP head (86.875 ft) and efficiency (0.74810)",
      },
    ],
    compute: (a) => pumpPowerAt(curveOf(a.curve), a.flow, a.density),
  }),
  defineSpec({
    id: "PUMP.DUTY",
    topic: "pumpCurve",
    purpose: "Operating point where the pump curve meets the system curve; spills flow and head.",
    params: [
      curveParam,
      { name: "static_head", kind: "quantity", dim: "length", description: "Static head: rise from suction surface to discharge, plus any pressure difference as head." },
      { name: "system", kind: "table", table: "segments", scalar: "ratio", description: "Resistance k in H = Hs + k·Q² (s²/m⁵), or a segments table (Length, ID, Roughness, K)." },
      kinematicViscosityParam,
      flowUnit,
      headUnit,
    ],
    result: { dim: "flow", description: "One row: flow, head of the operating point.", spill: true, columns: (a) => [spillHeader("Flow", a.flow_unit, "flow"), spillHeader("Head", a.head_unit, "length")] },
    equation: String.raw`H_{pump}(Q) = H_s + \sum_i \Big(f_i\frac{L_i}{D_i} + \Sigma K_i\Big)\frac{V_i^2}{2g} \quad \text{or} \quad H_s + kQ^2`,
    derivation: (n) => `H_pump(Q*) = H_system(Q*) at Q* = ${n.step("Q*")}: ${n.step("H_pump(Q*)")} = ${n.step("H_system(Q*)")}`,
    assumptions: ["Steady flow; the pump curve is at the operating speed and impeller.", "Losses by Darcy–Weisbach with Colebrook in each segment."],
    validity: ["An error when the curves do not cross within the pump curve; two crossings (drooping curve) warn."],
    cautions: [DESIGN_AID],
    sources: ["Brent, R. P. (1973), Algorithms for Minimization without Derivatives, ch. 4 (root finding)", PCHIP_SOURCE],
    examples: [
      {
        args: [PARABOLA_CURVE, 20, 10000],
        expect: [[Math.sqrt(32 / 22000), 20 + (10000 * 32) / 22000]],
        tolerance: 2e-3,
        source: "Hand calculation: 52 − 12000Q² = 20 + 10000Q² gives Q = 0.03814 m³/s, H = 34.55 m (PCHIP through points on the parabola)",
      },
    ],
    compute: (a) => {
      const curve = curveOf(a.curve);
      const head = curveInterpolant("curve", curve, "head");
      const losses = systemLosses(a.system, a.kinematic_viscosity);
      checkSystem(a.static_head, losses);
      const p = operatingPoint(head, (q) => systemHeadAt(q, a.static_head, losses));
      const sys = systemHead(p.value.flow, a.static_head, losses);
      const bep = dutyAgainstBep(curve, p.value.flow);
      return ok([[spillValue("flow_unit", p.value.flow, "flow", a.flow_unit), spillValue("head_unit", p.value.head, "length", a.head_unit)]], [...p.warnings, ...sys.warnings, ...bep.warnings], [...(p.steps ?? []), ...(sys.steps ?? []), ...bep.steps]);
    },
  }),
  defineSpec({
    id: "PUMP.SCALE",
    topic: "pumpCurve",
    purpose: "A pump curve scaled by the affinity laws for a speed (or small diameter) ratio; spills the new curve.",
    params: [curveParam, { name: "ratio", kind: "quantity", dim: "ratio", description: "Speed ratio N2/N1 (or impeller diameter ratio for small trims)." }],
    result: { dim: "flow", description: "The curve with flow × r, head and NPSHr × r², power × r³, efficiency unchanged; same columns, header and units.", spill: true },
    equation: String.raw`Q_2 = rQ_1,\quad H_2 = r^2 H_1,\quad NPSH_{r,2} = r^2 NPSH_{r,1},\quad P_2 = r^3 P_1,\quad \eta_2 = \eta_1`,
    derivation: (n) => `Q₂ = r·Q₁, H₂ = r²·H₁, NPSHr₂ = r²·NPSHr₁, P₂ = r³·P₁ at every point, with r = ${n.step("r")}: r² = ${n.step("r²")}, r³ = ${n.step("r³")}`,
    assumptions: ["Efficiency unchanged; NPSHr scaled by r² (approximate: makers' data are better)."],
    validity: ["Ratios far from 1 warn."],
    cautions: [DESIGN_AID],
    sources: ["Affinity laws; ANSI/HI 1.3"],
    examples: [
      {
        args: [[["Flow (gpm)", "Head (ft)"], [0, 100], [200, 92], [400, 60]], 0.5],
        expect: [["Flow (gpm)", "Head (ft)"], [0, 25], [100, 23], [200, 15]],
        source: "Affinity laws Q ∝ r, H ∝ r² (definition)",
      },
    ],
    compute: (a) => {
      const t = a.curve;
      curveFromTable("curve", t);
      const scale = curveScaleFactors(a.ratio);
      return ok(spillTable(t, (role, v) => v * scale.value(role)), scale.warnings, scale.steps);
    },
  }),
  defineSpec({
    id: "PUMP.COMBINE",
    topic: "pumpCurve",
    purpose: "Curve of identical pumps in parallel (flows add) or series (heads add); spills the combined curve.",
    params: [
      curveParam,
      { name: "count", kind: "quantity", dim: "ratio", description: "Number of identical pumps running, 1 or more." },
      { name: "arrangement", kind: "choice", options: ["parallel", "series"], description: '"parallel" or "series".' },
    ],
    result: { dim: "flow", description: "The combined curve; same columns, header and units.", spill: true },
    equation: String.raw`\text{parallel: } Q_n = nQ,\ P_n = nP; \quad \text{series: } H_n = nH,\ P_n = nP`,
    derivation: (n) => `${n.arg("arrangement")} with n = ${n.step("n")}: ${n.arg("arrangement") === "parallel" ? "Q_n = n·Q" : "H_n = n·H"} and P_n = n·P at every point of the curve`,
    assumptions: ["Identical pumps at the same speed; NPSHr is each pump's at its own flow; efficiency unchanged.", "Parallel pumps share the same head; losses in their own branches are not included."],
    validity: ["count a whole number from 1 to 20."],
    cautions: [DESIGN_AID, "Check each pump alone can run safely when another trips (run-out, NPSH, motor power)."],
    sources: ["Pumps in parallel and series (any pump handbook; ANSI/HI 1.3)"],
    examples: [
      {
        args: [[["Flow (gpm)", "Head (ft)"], [0, 100], [200, 92], [400, 60]], 2, "parallel"],
        expect: [["Flow (gpm)", "Head (ft)"], [0, 100], [400, 92], [800, 60]],
        source: "Parallel identical pumps: flow doubles at each head (definition)",
      },
    ],
    compute: (a) => {
      const factor = combineFactors(a.count, a.arrangement);
      curveFromTable("curve", a.curve);
      return ok(spillTable(a.curve, (role, v) => v * factor.value(role)), [], factor.steps);
    },
  }),
  defineSpec({
    id: "PUMP.SELECT",
    topic: "pumpCurve",
    purpose: "From a family of impeller curves, the smallest impeller that meets a duty; spills impeller, head, efficiency and NPSHr at the duty flow.",
    params: [
      { name: "family", kind: "table", table: "family", description: "Impeller family: Impeller, Flow, Head and optionally Eff, NPSHr columns, one row per point." },
      { name: "flow", kind: "quantity", dim: "flow", description: "Duty flow." },
      { name: "head", kind: "quantity", dim: "length", description: "Head needed at the duty flow." },
      unitParam('"ft" or "m" (head and NPSHr)'),
    ],
    result: {
      dim: "length",
      description: "One row: impeller (in the family's unit, or its label), head at the duty flow, efficiency (fraction), NPSHr; blank where the family has no such column.",
      spill: true,
      columns: (a) => ["Impeller", spillHeader("Head", a.unit, "length"), "Efficiency (fraction)", spillHeader("NPSHr", a.unit, "length")],
    },
    equation: String.raw`D^* = \min\{D : H_D(Q_{duty}) \ge H_{duty}\}`,
    derivation: (n) => `smallest D with H_D(Q) ≥ H at Q = ${n.arg("flow")}, H = ${n.arg("head")}`,
    assumptions: ["Sized impellers are compared smallest first; labelled ones in the order listed.", "The chosen impeller gives at least the duty head; the operating point will sit where its curve meets the system (see PUMP.DUTY, TRIM)."],
    validity: ["An error when no impeller reaches the duty, or the duty flow is beyond every curve."],
    cautions: [DESIGN_AID],
    sources: ["Selection practice as in pump makers' catalogues; curves evaluated by PCHIP (" + PCHIP_SOURCE + ")"],
    examples: [
      {
        args: [
          [
            ["Impeller (mm)", "Flow (m^3/h)", "Head (m)", "Eff (%)"],
            [250, 0, 40, 0], [250, 50, 38.5, 62], [250, 100, 34, 74], [250, 150, 26, 70],
            [230, 0, 34, 0], [230, 50, 32.6, 60], [230, 100, 28.5, 72], [230, 150, 21, 67],
            [210, 0, 28, 0], [210, 50, 26.8, 58], [210, 100, 23, 69], [210, 150, 16, 63],
          ],
          "80 m^3/h",
          "29 m",
        ],
        expect: [[230, 30.506270094043888, 0.69696, ""]],
        tolerance: 1e-12,
        source: "SciPy PchipInterpolator on the 230 mm curve at 80 m³/h (invented family): 230 mm gives 30.506 m at 69.70 %; 210 mm gives only 24.87 m",
      },
    ],
    compute: (a) => {
      const selection = selectImpeller(impellersFromTable("family", a.family), a.flow, a.head);
      const choice = selection.value;
      const out = (v: number | undefined) => (v === undefined ? "" : spillValue("unit", v, "length", a.unit));
      const size = choice.impeller.size === null ? choice.impeller.label : Number(choice.impeller.label);
      return ok([[size, out(choice.head), choice.efficiency ?? "", out(choice.npshr)]], selection.warnings, selection.steps);
    },
  }),
];
