import { bestEfficiencyPoint, checkLimits, type Corner, endOfCurvePower, envelope, MIN_MARGIN_DEFAULT, type OperatingLimits, POR_DEFAULT, regionOf, selectOverEnvelope } from "../calc/envelope";
import { curveInterpolant } from "../calc/pumpCurve";
import { largestRating, MOTOR_SERIES, motorSize } from "../calc/motor";
import { CalcError, ok } from "../calc/_lib/result";
import { STANDARD_ATMOSPHERE } from "../calc/_lib/constants";
import { CAVITATION_CAUTION, curveParam, DESIGN_AID, densityParam, EXAMPLE_CURVE_US, flowParam } from "./_shared";
import { casesFromTable, curveFromTable, impellersFromTable, segmentsFromTable, spillHeader, spillValue } from "./_tables";
import { type Cell, defineSpec, type FunctionSpec, type QuantityParam, type TableParam, type UnitParam } from "./types";

const POR_NOTE = "70 %–120 % of BEP flow, the range commonly cited from ANSI/HI 9.6.3 (common practice, from memory); give the pump maker's own limits where known";
const porLow = { name: "por_low", kind: "quantity", dim: "efficiency", optional: true, default: POR_DEFAULT[0], defaultNote: "0.7 (70 % of BEP flow, common practice)", description: 'Lower end of the preferred operating region as a fraction of BEP flow (0.7 or "70%").' } as const satisfies QuantityParam;
const porHigh = { name: "por_high", kind: "quantity", dim: "ratio", optional: true, default: POR_DEFAULT[1], defaultNote: "1.2 (120 % of BEP flow, common practice)", description: "Upper end of the preferred operating region as a fraction of BEP flow (1.2)." } as const satisfies QuantityParam;
const bepFlow = { name: "bep_flow", kind: "quantity", dim: "flow", optional: true, description: "The pump maker's best efficiency flow; fitted from the efficiency column when left out." } as const satisfies QuantityParam;
const minFlow = { name: "min_flow", kind: "quantity", dim: "flow", optional: true, description: "Minimum continuous stable flow from the pump maker, at the curve's speed." } as const satisfies QuantityParam;
const flowUnit = { name: "flow_unit", kind: "unit", optional: true, description: 'Unit of the spilled flows, such as "gpm"; m³/s when left out.' } as const satisfies UnitParam;
const headUnit = { name: "head_unit", kind: "unit", optional: true, description: 'Unit of the spilled heads, such as "ft"; m when left out.' } as const satisfies UnitParam;
const powerUnit = { name: "power_unit", kind: "unit", optional: true, description: 'Unit of the spilled powers, such as "hp" or "kW"; W when left out.' } as const satisfies UnitParam;
const casesParam = {
  name: "cases",
  kind: "table",
  table: "cases",
  description:
    "One row per corner of the envelope, the design duty first: Case, Suction level, Suction pressure (gauge), Discharge level, Discharge pressure (gauge), Roughness (all pipes; blank for the segments' own), Temperature, Pumps (running in parallel), Speed (ratio to the curve's), Hours (per year).",
} as const satisfies TableParam;
const suctionParam = { name: "suction", kind: "table", table: "segments", description: "Suction line of each pump: Length, ID, Roughness, K." } as const satisfies TableParam;
const dischargeParam = { name: "discharge", kind: "table", table: "segments", description: "Discharge line shared by the pumps running: Length, ID, Roughness, K." } as const satisfies TableParam;
const pumpLevel = { name: "pump_level", kind: "quantity", dim: "length", optional: true, default: 0, defaultNote: "0: the levels are heights above the impeller eye", description: "Elevation of the impeller eye on the levels' datum." } as const satisfies QuantityParam;
const atmosphere = { name: "atmosphere", kind: "quantity", dim: "pressure", optional: true, default: STANDARD_ATMOSPHERE, defaultNote: "101.325 kPa, sea level; use NAPPE.ATMPRESSURE for the site", description: "Atmospheric pressure at the site, absolute." } as const satisfies QuantityParam;
const minMargin = { name: "min_margin", kind: "quantity", dim: "ratio", optional: true, default: MIN_MARGIN_DEFAULT, defaultNote: "1.1, the least ANSI/HI 9.6.1 suggests (from memory)", description: "Least NPSH margin ratio NPSHa/NPSHr accepted." } as const satisfies QuantityParam;

const CURVE_US = EXAMPLE_CURVE_US;
/** The cases, the lines and the site, as PUMP.ENVELOPE and PUMP.SHORTLIST both take them. */
const ENVELOPE_PARAMS = [casesParam, suctionParam, dischargeParam, pumpLevel, atmosphere, minMargin] as const;
/** Invented lines and cases (test/reference/envelope_reference.py solves the same ones with SciPy). */
const SUCTION = [["Length (m)", "ID (m)", "Roughness (m)", "K"], [6, 0.1541, 4.5e-5, 2]];
const DISCHARGE = [["Length (m)", "ID (m)", "Roughness (m)", "K"], [250, 0.1023, 4.5e-5, 8]];
const CASES = [
  ["Case", "Suction level (m)", "Discharge level (m)", "Roughness (m)", "Temperature (degC)", "Pumps", "Speed", "Hours"],
  ["design", 2, 12, "", 15, 1, 1, 3000],
  ["low level, aged pipe", -1.5, 12, 5e-4, 30, 1, 1, 1000],
];
const ENVELOPE_SOURCE = "test/reference/envelope_reference.py: SciPy PCHIP, brentq crossing and Colebrook, numpy.polyfit BEP; water from handbook tables (from memory)";

const limitsOf = (a: { por_low: number; por_high: number; min_flow?: number }): OperatingLimits => {
  const limits: OperatingLimits = { por: [a.por_low, a.por_high], minFlow: a.min_flow };
  checkLimits(limits);
  return limits;
};
const pct = (x: number | undefined): Cell => (x === undefined ? "" : x * 100);
const verdictText = (c: Corner) => (c.status === "ok" ? "ok" : `${c.status === "fails" ? "fails" : "warning"}: ${c.reasons.join("; ")}`);

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "PUMP.BEP",
    topic: "envelope",
    purpose: "Best efficiency point of a pump curve and its preferred operating region; spills one labelled row.",
    params: [curveParam, bepFlow, porLow, porHigh, flowUnit, headUnit],
    result: { dim: "flow", description: "Header row, then BEP flow, BEP head, BEP efficiency (%), and the preferred region's lower and upper flows.", spill: true },
    equation: String.raw`Q_{BEP} = \arg\max_Q\,(aQ^2 + bQ + c) = -\frac{b}{2a}, \quad POR = [0.7,\ 1.2]\,Q_{BEP}`,
    derivation: (n) => `Q_BEP = −b/(2a) of the least-squares parabola through the efficiency points around the top one = ${n.step("Q_BEP")}, η = ${n.step("η_BEP")}, H = ${n.step("H_BEP")}`,
    assumptions: ["A PCHIP curve peaks exactly at a table point, so the BEP is the vertex of a least-squares parabola through the top efficiency point and up to two neighbours each side.", `Preferred operating region ${POR_NOTE}.`],
    validity: ["Needs an efficiency column (or the maker's BEP flow); without a clear peak the top point is used, with a warning."],
    cautions: [DESIGN_AID],
    sources: ["ANSI/HI 9.6.3, Rotodynamic Pumps: Guideline for Operating Regions (POR 70 %–120 % as commonly cited; from memory)", "Least squares as numpy.polyfit"],
    examples: [
      {
        args: [CURVE_US, null, null, null, "gpm", "ft"],
        expect: [["BEP flow (gpm)", "BEP head (ft)", "BEP efficiency (%)", "POR from (gpm)", "POR to (gpm)"], [292.608695652174, 81.09736557902522, 76.48141304347827, 204.82608695652178, 351.13043478260875]],
        tolerance: 1e-9,
        source: "numpy.polyfit (degree 2) through 100–400 gpm and its vertex, SciPy PCHIP head there (test/reference/envelope_reference.py)",
      },
    ],
    compute: (a) => {
      const curve = curveFromTable("curve", a.curve);
      const limits = limitsOf({ por_low: a.por_low, por_high: a.por_high });
      const bep = bestEfficiencyPoint(curve, a.bep_flow);
      const f = (v: number) => spillValue("flow_unit", v, "flow", a.flow_unit);
      const { flow, head, efficiency } = bep.value;
      return ok(
        [
          [spillHeader("BEP flow", a.flow_unit, "flow"), spillHeader("BEP head", a.head_unit, "length"), "BEP efficiency (%)", spillHeader("POR from", a.flow_unit, "flow"), spillHeader("POR to", a.flow_unit, "flow")],
          [f(flow), spillValue("head_unit", head, "length", a.head_unit), efficiency * 100, f(limits.por[0] * flow), f(limits.por[1] * flow)],
        ],
        bep.warnings,
        bep.steps,
      );
    },
  }),
  defineSpec({
    id: "PUMP.REGION",
    topic: "envelope",
    purpose: "A duty flow as a fraction of the best efficiency flow: warns outside the preferred region, an error outside the allowable region or below the minimum flow.",
    params: [
      flowParam,
      curveParam,
      bepFlow,
      porLow,
      porHigh,
      { name: "aor_low", kind: "quantity", dim: "flow", optional: true, description: "Lower flow of the allowable operating region (the maker's); the curve's first flow when left out." },
      { name: "aor_high", kind: "quantity", dim: "flow", optional: true, description: "Upper flow of the allowable operating region (the maker's); the curve's last flow when left out." },
      minFlow,
    ],
    result: { dim: "ratio", description: "Flow over BEP flow (0.85 is 85 % of BEP)." },
    equation: String.raw`\frac{Q}{Q_{BEP}}, \quad 0.7 \le \frac{Q}{Q_{BEP}} \le 1.2 \ \text{(POR)}, \quad Q \in AOR`,
    derivation: (n) => `Q/Q_BEP = ${n.arg("flow")}/${n.step("Q_BEP")} = ${n.result}`,
    assumptions: [`Preferred operating region ${POR_NOTE}.`, "Allowable region: the maker's, or the curve's flow range when not given."],
    validity: ["Outside the allowable region or below the minimum continuous stable flow is an error, never a value."],
    cautions: [DESIGN_AID, "Long running outside the preferred region shortens bearing and seal life and raises vibration; below minimum flow the pump can overheat."],
    sources: ["ANSI/HI 9.6.3 (from memory)"],
    examples: [{ args: ["250 gpm", CURVE_US], expect: 0.8543833580980682, tolerance: 1e-9, source: "250 gpm over the BEP flow of numpy.polyfit in Python (test/reference/examples_reference.py)" }],
    compute: (a) => {
      const curve = curveFromTable("curve", a.curve);
      const head = curveInterpolant("curve", curve, "head");
      const limits: OperatingLimits = { ...limitsOf({ por_low: a.por_low, por_high: a.por_high, min_flow: a.min_flow }), aor: a.aor_low !== undefined || a.aor_high !== undefined ? [a.aor_low ?? head.min, a.aor_high ?? head.max] : undefined };
      checkLimits(limits);
      const bep = bestEfficiencyPoint(curve, a.bep_flow);
      const region = regionOf(a.flow, bep.value, limits, head);
      if (region.failures.length) throw new CalcError("flow", region.failures.join("; "));
      return ok(region.fraction, [...bep.warnings, ...region.warnings.map((w) => `${w}: fine for short spells; for long running, confirm with the pump maker.`)], bep.steps);
    },
  }),
  defineSpec({
    id: "PUMP.MAXPOWER",
    topic: "envelope",
    purpose: "The largest shaft power the pump can draw anywhere on its curve, to the end of the table, and the motor rating that covers it; spills one labelled row.",
    params: [
      curveParam,
      densityParam,
      { name: "ratio", kind: "quantity", dim: "ratio", optional: true, default: 1, defaultNote: "1, the curve's speed", description: "Speed ratio to the curve's speed (power scales as its cube)." },
      { name: "series", kind: "choice", options: MOTOR_SERIES, optional: true, default: "nema", defaultNote: "NEMA (hp ratings)", description: '"NEMA" (default) or "IEC".' },
      flowUnit,
      powerUnit,
    ],
    result: { dim: "power", description: "Header row, then the largest shaft power, the flow where it occurs, and the next standard motor rating at or above it.", spill: true },
    equation: String.raw`P_{max} = \max_{Q \le Q_{end}} \frac{\rho g Q H(Q)}{\eta(Q)}\,r^3`,
    derivation: (n) => `P_max = ${n.step("P_max")} at Q = ${n.step("Q(P_max)")} ⇒ motor ${n.step("motor")}`,
    assumptions: ["The pump can run out to the end of its curve (a burst main, a second pump tripping, low discharge level), so its motor is sized for the largest power there: a non-overloading motor.", "Power from the power column where there is one, else ρgQH/η."],
    validity: ["Needs a power column, or head and efficiency columns."],
    cautions: [DESIGN_AID, "Motors, starters and wiring follow the electrical code; ask a licensed electrical engineer."],
    sources: ["Definition of pump input power (ANSI/HI 1.6)", "NEMA MG 1 / IEC 60072-1 ratings (from memory)"],
    examples: [
      {
        args: [CURVE_US, 999.1, null, "nema", "gpm", "hp"],
        expect: [["Largest shaft power (hp)", "At flow (gpm)", "Motor (hp)"], [8.662746584948067, 400.0, 10]],
        tolerance: 1e-6,
        source: "The largest ρgQH/η on a 200001-point grid of the SciPy PCHIP curves (test/reference/examples_reference.py): at the end of the curve; NEMA 7.5 then 10 hp",
      },
    ],
    compute: (a) => {
      const curve = curveFromTable("curve", a.curve);
      const max = endOfCurvePower(curve, a.density, a.ratio);
      const motor = motorSize(max.value.power, a.series, 0, "curve");
      const p = (v: number) => spillValue("power_unit", v, "power", a.power_unit);
      return ok(
        [[spillHeader("Largest shaft power", a.power_unit, "power"), spillHeader("At flow", a.flow_unit, "flow"), spillHeader("Motor", a.power_unit, "power")], [p(max.value.power), spillValue("flow_unit", max.value.flow, "flow", a.flow_unit), p(motor.value)]],
        [],
        [...(max.steps ?? []), { symbol: "motor", name: "next standard rating at or above P_max", value: motor.value, dim: "power", how: `${a.series.toUpperCase()} ratings` }],
      );
    },
  }),
  defineSpec({
    id: "PUMP.ENVELOPE",
    topic: "envelope",
    purpose: "The operating point, % of BEP, efficiency, shaft power, NPSHa against NPSHr and a verdict at every corner of an envelope of cases; spills a labelled table.",
    params: [
      curveParam,
      ...ENVELOPE_PARAMS,
      { name: "motor", kind: "quantity", dim: "power", optional: true, description: "Motor rating: a corner whose shaft power exceeds it fails; a warning says when it covers every case but not the end of the curve." },
      bepFlow,
      minFlow,
      flowUnit,
      headUnit,
      powerUnit,
      porLow,
      porHigh,
    ],
    result: { dim: "flow", description: "Header row with units, then one row per case: Case, Flow, Flow per pump, Head, % of BEP, Eff (%), Shaft power per pump, NPSHa, NPSHr, NPSH margin, Energy (kWh per year, shaft, all pumps), Verdict.", spill: true },
    equation: String.raw`r^2 H_c\!\left(\tfrac{q}{r}\right) = z_d - z_s + \frac{p_d - p_s}{\rho g} + h_s(q) + h_d(nq), \quad NPSHa = \frac{p_{atm} + p_s - p_v}{\rho g} + z_s - z_{eye} - h_s(q)`,
    derivation: (n) => `at every case: r²·Hc(q/r) = static head + h_s(q) + h_d(n·q) by Brent's method; BEP ${n.step("Q_BEP")}${n.has("M_min") ? `; smallest NPSH margin ${n.step("M_min")}` : ""}${n.has("P_env") ? `; largest shaft power ${n.step("P_env")}` : ""}`,
    assumptions: [
      "Each pump running has its own suction line (the suction table); the discharge line is shared, carrying the flow of every pump running.",
      "Speed changes by the affinity laws: head and NPSHr × r², flow × r, efficiency unchanged.",
      "Water properties at each case's temperature (IAPWS-IF97 and IAPWS 2008) at the atmospheric pressure given.",
      `Preferred operating region ${POR_NOTE}.`,
      "Energy is shaft energy of all the pumps running over the case's hours; divide by the motor efficiency for the meter.",
    ],
    validity: ["A corner beyond the curve's end (no extrapolation) is a failing row that says so, not an error of the whole table.", "Pumps from 1 to 20; speed ratio above 0.2 to 2."],
    cautions: [DESIGN_AID, CAVITATION_CAUTION, "Check each pump alone can run safely when another trips (run-out, NPSH, motor power)."],
    sources: ["ANSI/HI 9.6.3 operating regions and ANSI/HI 9.6.1 NPSH margin (from memory)", "Darcy–Weisbach with Colebrook; affinity laws (ANSI/HI 1.3)"],
    examples: [
      {
        args: [CURVE_US, CASES, SUCTION, DISCHARGE, null, null, null, null, null, null, "gpm", "ft", "hp"],
        expect: [["Case", "Flow (gpm)", "Flow per pump (gpm)", "Head (ft)", "% of BEP", "Eff (%)", "Shaft power per pump (hp)", "NPSHa (ft)", "NPSHr (ft)", "NPSH margin", "Energy (kWh/yr)", "Verdict"], ["design", 299.2150834252069, 299.2150834252069, 80.11761378383066, 102.25775510816875, 75.9996604182808, 7.969704975193729, 39.45305548287742, 10.97062100437054, 3.596246326179701, 17829.02392965163, "ok"], ["low level, aged pipe", 232.93332378464865, 232.93332378464865, 88.85875179810992, 79.6057421552291, 73.97509929713443, 7.045088008938994, 27.379058934971383, 8.844564883824383, 3.095580087274197, 5253.5212235516, "ok"]],
        // Water in the reference is from 5-figure handbook tables, so the corners agree to about 1e-5.
        tolerance: 2e-5,
        source: `${ENVELOPE_SOURCE} (test/reference/examples_reference.py)`,
      },
    ],
    compute: (a) => {
      const curve = curveFromTable("curve", a.curve);
      const result = envelope(
        curve,
        limitsOf({ por_low: a.por_low, por_high: a.por_high, min_flow: a.min_flow }),
        casesFromTable("cases", a.cases),
        { suction: segmentsFromTable("suction", a.suction), discharge: segmentsFromTable("discharge", a.discharge), pumpLevel: a.pump_level, atmosphere: a.atmosphere },
        a.min_margin,
        a.motor,
        a.bep_flow,
      );
      const f = (v: number | undefined) => (v === undefined ? "" : spillValue("flow_unit", v, "flow", a.flow_unit));
      const h = (v: number | undefined) => (v === undefined ? "" : spillValue("head_unit", v, "length", a.head_unit));
      const p = (v: number | undefined) => (v === undefined ? "" : spillValue("power_unit", v, "power", a.power_unit));
      const header: Cell[] = ["Case", spillHeader("Flow", a.flow_unit, "flow"), spillHeader("Flow per pump", a.flow_unit, "flow"), spillHeader("Head", a.head_unit, "length"), "% of BEP", "Eff (%)", spillHeader("Shaft power per pump", a.power_unit, "power"), spillHeader("NPSHa", a.head_unit, "length"), spillHeader("NPSHr", a.head_unit, "length"), "NPSH margin", "Energy (kWh/yr)", "Verdict"];
      const rows = result.value.corners.map((c): Cell[] => [c.label, f(c.flowTotal), f(c.flowPerPump), h(c.head), pct(c.fractionOfBep), pct(c.efficiency), p(c.shaftPower), h(c.npsha), h(c.npshr), c.margin ?? "", c.energy === undefined ? "" : c.energy / 3.6e6, verdictText(c)]);
      return ok([header, ...rows], result.warnings, result.steps);
    },
  }),
  defineSpec({
    id: "PUMP.SHORTLIST",
    topic: "envelope",
    purpose: "Every impeller of a family compared over an envelope of cases, with the recommended one and why each other lost; spills a labelled table.",
    params: [
      { name: "family", kind: "table", table: "family", description: "Impeller family: Impeller, Flow, Head, Eff and NPSHr columns, one row per point." },
      ...ENVELOPE_PARAMS,
      { name: "series", kind: "choice", options: MOTOR_SERIES, optional: true, default: "nema", defaultNote: "NEMA (hp ratings)", description: '"NEMA" (default) or "IEC" motor ratings.' },
      flowUnit,
      headUnit,
      powerUnit,
      { name: "duty_flow", kind: "quantity", dim: "flow", optional: true, description: "Flow the design case must deliver; a candidate delivering less fails." },
    ],
    result: { dim: "flow", description: "Header row with units, then one row per impeller: Impeller, design Flow, Head, % of BEP, Eff (%), Shaft power, End-of-curve power, Motor, Worst NPSH margin, Energy (kWh/yr), Verdict.", spill: true },
    equation: String.raw`D^* = \arg\max_{D\ \text{passing every case}} \eta_D(Q_{design})`,
    derivation: (n) => (n.has("η_design") ? `recommended: the candidate passing every check at every case with the best design-duty efficiency, ${n.step("η_design")}` : "no candidate passes every check at every case"),
    assumptions: [
      "The first case is the design duty; every case is checked (operating region, NPSH margin, beyond-curve corners); with a duty flow, the design case must deliver it.",
      "Each candidate's motor is the next standard rating covering both its end-of-curve power (at the highest speed in the cases) and every corner, so it never overloads.",
      "PUMP.SELECT keeps its simple rule beside this: the smallest impeller reaching one duty point.",
    ],
    validity: ["Impellers without an efficiency column cannot be judged and say so."],
    cautions: [DESIGN_AID, CAVITATION_CAUTION],
    sources: ["ANSI/HI 9.6.3 and 9.6.1 (from memory)", "Selection practice: best efficiency at the design duty among candidates that pass everywhere"],
    examples: [
      {
        args: [
          [
            ["Impeller (mm)", "Flow (gpm)", "Head (ft)", "Eff (%)", "NPSHr (ft)"],
            [230, 0, 86, 0, ""], [230, 100, 84, 53, 6], [230, 200, 78, 70, 8], [230, 300, 66, 73, 11], [230, 400, 46, 66, 16],
            [250, 0, 100, 0, ""], [250, 100, 98, 55, 6], [250, 200, 92, 72, 8], [250, 300, 80, 76, 11], [250, 400, 60, 70, 16],
          ],
          CASES,
          SUCTION,
          DISCHARGE,
          null,
          null,
          null,
          "nema",
          "gpm",
          "ft",
          "hp",
        ],
        expect: [["Impeller", "Flow (gpm)", "Head (ft)", "% of BEP", "Eff (%)", "Shaft power (hp)", "End-of-curve power (hp)", "Motor (hp)", "Worst NPSH margin", "Energy (kWh/yr)", "Verdict"], [230, 266.6409953632355, 70.74416338347656, 93.5582439871001, 72.59940936233156, 6.564880992920831, 7.139426694022306, 7.5, 3.412527798130344, 18896.558880689874, "passes, but 72.6 % at the design duty against 76.0 % for 250"], [250, 299.2150834252069, 80.11761378383066, 102.25775510816875, 75.9996604182808, 7.969704975193729, 8.662746584948067, 10, 3.095580087274197, 23082.54515320323, "recommended: passes every check at every corner, with the best efficiency at the design duty (76.0 %)"]],
        tolerance: 2e-5,
        source: `${ENVELOPE_SOURCE}: both impellers over the two cases, NEMA ratings (test/reference/examples_reference.py)`,
      },
    ],
    compute: (a) => {
      const impellers = impellersFromTable("family", a.family);
      const motorFor = (power: number) => (power <= largestRating(a.series) * (1 + 1e-12) ? motorSize(power, a.series, 0).value : undefined);
      const result = selectOverEnvelope(
        impellers,
        limitsOf({ por_low: POR_DEFAULT[0], por_high: POR_DEFAULT[1] }),
        casesFromTable("cases", a.cases),
        { suction: segmentsFromTable("suction", a.suction), discharge: segmentsFromTable("discharge", a.discharge), pumpLevel: a.pump_level, atmosphere: a.atmosphere },
        a.min_margin,
        motorFor,
        a.duty_flow,
      );
      const f = (v: number | undefined) => (v === undefined ? "" : spillValue("flow_unit", v, "flow", a.flow_unit));
      const p = (v: number | undefined) => (v === undefined ? "" : spillValue("power_unit", v, "power", a.power_unit));
      const header: Cell[] = ["Impeller", spillHeader("Flow", a.flow_unit, "flow"), spillHeader("Head", a.head_unit, "length"), "% of BEP", "Eff (%)", spillHeader("Shaft power", a.power_unit, "power"), spillHeader("End-of-curve power", a.power_unit, "power"), spillHeader("Motor", a.power_unit, "power"), "Worst NPSH margin", "Energy (kWh/yr)", "Verdict"];
      const imp = impellers.map((i) => (i.size === null ? i.label : Number(i.label)));
      const rows = result.value.map((c, i): Cell[] => {
        const d = c.design;
        return [imp[i], f(d?.flowTotal), d?.head === undefined ? "" : spillValue("head_unit", d.head, "length", a.head_unit), pct(d?.fractionOfBep), pct(d?.efficiency), p(d?.shaftPower), p(c.endPower), p(c.motor), c.worstMargin ?? "", c.energy === undefined ? "" : c.energy / 3.6e6, c.verdict];
      });
      return ok([header, ...rows], result.warnings, result.steps);
    },
  }),
];
