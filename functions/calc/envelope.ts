/**
 * A pump over its operating envelope: the best efficiency point and the operating regions
 * around it, the largest power the pump can draw on its curve, and the operating point, NPSH
 * margin and verdict at every corner of a table of cases (suction and discharge levels and
 * pressures, pipe roughness, water temperature, pumps running in parallel, speed, hours).
 * SI in and out.
 */
import { CalcError, type CalcResult, ok, quoted, step, type Step } from "./_lib/result";
import { STANDARD_GRAVITY } from "./_lib/constants";
import { evaluatePolynomial, fitPolynomial } from "./_lib/leastSquares";
import { operatingPoint } from "./operatingPoint";
import { curveInterpolant, type Interpolant, type PumpCurve, valueAt } from "./pumpCurve";
import { checkSystem, type PipeSegment, systemHeadAt } from "./systemCurve";
import { saturationPressure, waterDensity, waterKinematicViscosity } from "./water";

/** Preferred operating region as fractions of BEP flow: 70 %–120 %, as commonly cited from ANSI/HI 9.6.3 (common practice, from memory). */
export const POR_DEFAULT = [0.7, 1.2] as const;
/** The least NPSH margin ratio ANSI/HI 9.6.1 suggests for any service (from memory). */
export const MIN_MARGIN_DEFAULT = 1.1;

interface Bep {
  flow: number;
  head: number;
  efficiency: number;
}

/**
 * The best efficiency point. A PCHIP curve peaks exactly at a table point, so the peak is taken
 * from a least-squares parabola through the top efficiency point and up to two neighbours on
 * each side; where that parabola does not open downwards, or its vertex falls outside those
 * points, the top point itself is used (with a warning). `givenFlow` overrides the fit.
 */
export function bestEfficiencyPoint(curve: PumpCurve, givenFlow?: number): CalcResult<Bep> {
  const eff = curve.efficiency;
  if (!eff) throw new CalcError("curve", 'has no efficiency column, so no best efficiency point: add one headed "Eff (%)", or give the BEP flow', "value");
  const head = curveInterpolant("curve", curve, "head");
  const effAt = curveInterpolant("curve", curve, "efficiency");
  if (givenFlow !== undefined) {
    const h = valueAt("bep_flow", "head", head, givenFlow);
    return ok({ flow: givenFlow, head: h, efficiency: valueAt("bep_flow", "efficiency", effAt, givenFlow) }, [], [step("Q_BEP", "best efficiency flow", givenFlow, "flow", "as given (the pump maker's)")]);
  }
  const top = eff.y.indexOf(Math.max(...eff.y));
  let from = Math.max(0, top - 2);
  let to = Math.min(eff.x.length - 1, top + 2);
  while (to - from < 2) {
    if (from > 0) from--;
    else to++;
  }
  const xs = eff.x.slice(from, to + 1);
  const ys = eff.y.slice(from, to + 1);
  const fit = fitPolynomial(xs, ys, 2);
  const [, c1, c2] = fit.coefficients;
  const vertex = fit.centre + fit.scale * (-c1 / (2 * c2));
  const warnings: string[] = [];
  let flow = vertex;
  let how = `vertex of the least-squares parabola through the ${xs.length} efficiency points around the top one`;
  if (!(c2 < 0) || !(vertex >= xs[0] && vertex <= xs[xs.length - 1])) {
    flow = eff.x[top];
    how = "the table's top efficiency point (the parabola through its neighbours has no peak among them)";
    warnings.push("The efficiency points give no clear peak: the BEP is the table's top efficiency point; give the maker's BEP flow for a better one.");
  }
  if (flow < head.min || flow > head.max) throw new CalcError("curve", `the best efficiency flow ${quoted(flow, "flow")} is outside the head curve`, "value");
  const efficiency = flow === vertex ? evaluatePolynomial(fit, flow) : eff.y[top];
  return ok({ flow, head: head.at(flow), efficiency }, warnings, [
    step("Q_BEP", "best efficiency flow", flow, "flow", how),
    step("η_BEP", "best efficiency", efficiency, "efficiency", flow === vertex ? "the parabola at its vertex" : "the table's value"),
    step("H_BEP", "head at the best efficiency flow", head.at(flow), "length", "PCHIP through the head column"),
  ]);
}

/** Flow limits around the BEP, all as flows at the curve's speed. */
export interface OperatingLimits {
  /** Preferred operating region, fractions of BEP flow. */
  por: readonly [number, number];
  /** Allowable operating region, flows; the head curve's range when not given. */
  aor?: readonly [number, number];
  /** Minimum continuous stable flow, when the maker gives one. */
  minFlow?: number;
}

/** Checks the fractions of a POR and the order of an AOR; `arg` names what is wrong. */
export function checkLimits(limits: OperatingLimits): void {
  const [lo, hi] = limits.por;
  if (!(lo > 0 && lo < 1)) throw new CalcError("por_low", `expected a fraction of BEP flow between 0 and 1 (0.7 for 70 %); got ${lo}`);
  if (!(hi > 1 && hi < 3)) throw new CalcError("por_high", `expected a fraction of BEP flow above 1 (1.2 for 120 %); got ${hi}`);
  if (limits.aor && !(limits.aor[0] >= 0 && limits.aor[1] > limits.aor[0])) throw new CalcError("aor_high", "the allowable region's upper flow must be above its lower flow");
}

/** Where a flow sits against the BEP and the regions: its fraction of BEP flow, and what is wrong. */
interface RegionVerdict {
  fraction: number;
  /** Outside the preferred region. */
  warnings: string[];
  /** Outside the allowable region or below the minimum flow. */
  failures: string[];
}

/** A flow (at speed ratio r) against the BEP and regions of the curve at its own speed. */
export function regionOf(flow: number, bep: Bep, limits: OperatingLimits, head: Interpolant, r = 1): RegionVerdict {
  const fraction = flow / (r * bep.flow);
  // Whole percent, unless that would round onto a limit (69.6 % is not "70 %" of a 70 % limit).
  const limitsPct = [...limits.por].map((x) => Math.round(x * 100));
  const pct = (x: number) => (limitsPct.includes(Math.round(x * 100)) && Math.abs(x * 100 - Math.round(x * 100)) > 1e-9 ? `${(x * 100).toFixed(1)} %` : `${Math.round(x * 100)} %`);
  const warnings: string[] = [];
  const failures: string[] = [];
  const [aorLo, aorHi] = limits.aor ?? [head.min, head.max];
  if (flow < r * aorLo * (1 - 1e-9) || flow > r * aorHi * (1 + 1e-9)) failures.push(`${pct(fraction)} of BEP is outside the allowable region (${quoted(r * aorLo, "flow")} to ${quoted(r * aorHi, "flow")})`);
  if (limits.minFlow !== undefined && flow < r * limits.minFlow) failures.push(`below the minimum continuous stable flow ${quoted(r * limits.minFlow, "flow")}`);
  if (fraction < limits.por[0] || fraction > limits.por[1]) warnings.push(`${pct(fraction)} of BEP is outside the preferred region (${pct(limits.por[0])} to ${pct(limits.por[1])})`);
  return { fraction, warnings, failures };
}

/**
 * A duty on a curve against its BEP, for functions that keep their own results (PUMP.DUTY):
 * the flow as a fraction of BEP flow as a step, and a warning outside the preferred region.
 * Nothing when the curve has no efficiency column.
 */
export function dutyAgainstBep(curve: PumpCurve, flow: number): { warnings: string[]; steps: Step[] } {
  if (!curve.efficiency) return { warnings: [], steps: [] };
  const bep = bestEfficiencyPoint(curve);
  const region = regionOf(flow, bep.value, { por: POR_DEFAULT }, curveInterpolant("curve", curve, "head"));
  return {
    warnings: [...bep.warnings, ...region.warnings.map((w) => `${w} (common practice, ANSI/HI 9.6.3): see NAPPE.PUMP.ENVELOPE for every operating case.`)],
    steps: [step("Q_BEP", "best efficiency flow", bep.value.flow, "flow", "vertex of the least-squares parabola through the efficiency points around the top one"), step("Q*/Q_BEP", "duty flow as a fraction of BEP flow", region.fraction, "ratio", "preferred region 0.7 to 1.2 (common practice)")],
  };
}

/**
 * The largest shaft power on the whole curve, to the end of the table (at speed ratio r), and the
 * flow where it occurs: the best of 400 even steps and every table point, then a golden-section
 * search between that point's neighbours to a flow within 1e-9 of itself.
 */
export function endOfCurvePower(curve: PumpCurve, density: number, r = 1): CalcResult<{ power: number; flow: number }> {
  if (!(r > 0) || !Number.isFinite(r)) throw new CalcError("ratio", `expected a speed ratio above 0 (1 is the curve's own speed); got ${r}`);
  const head = curveInterpolant("curve", curve, "head");
  const powerAt = shaftPowerFunction(curve, density);
  const n = 400;
  const dq = (head.max - head.min) / n;
  let best = { power: -Infinity, flow: head.min };
  const at = (q: number) => {
    const p = powerAt(q);
    if (p !== undefined && p > best.power) best = { power: p, flow: q };
  };
  for (let i = 0; i <= n; i++) at(head.min + dq * i);
  for (const q of curve.head.x) at(q);
  if (!Number.isFinite(best.power)) throw new CalcError("curve", "needs a power column, or head and efficiency columns, to find the power along the curve", "value");
  // Golden-section search for the maximum between the best point's neighbours.
  let a = Math.max(head.min, best.flow - dq);
  let b = Math.min(head.max, best.flow + dq);
  const f = (q: number) => powerAt(q) ?? -Infinity;
  const k = (Math.sqrt(5) - 1) / 2;
  let c = b - k * (b - a);
  let d = a + k * (b - a);
  let fc = f(c);
  let fd = f(d);
  for (let i = 0; i < 200 && b - a > 1e-10 * Math.max(Math.abs(best.flow), dq); i++) {
    if (fc >= fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - k * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + k * (b - a);
      fd = f(d);
    }
  }
  at((a + b) / 2);
  const scaled = { power: best.power * r ** 3, flow: best.flow * r };
  return ok(scaled, [], [
    step("P_max", "largest shaft power on the curve", scaled.power, "power", "ρgQH/η (or the power column) at 400 even steps and every table point, to the end of the table, then refined between the best step's neighbours (golden section)"),
    step("Q(P_max)", "flow where it occurs", scaled.flow, "flow", best.flow >= head.max * (1 - 1e-9) ? "the end of the curve" : "inside the curve"),
  ]);
}

/** Shaft power at a flow on the curve at its own speed, W, or undefined where efficiency is zero. */
function shaftPowerFunction(curve: PumpCurve, density: number): (flow: number) => number | undefined {
  if (curve.power) {
    const p = curveInterpolant("curve", curve, "power");
    return (q) => (q >= p.min && q <= p.max ? p.at(q) : undefined);
  }
  if (!curve.efficiency) return () => undefined;
  const head = curveInterpolant("curve", curve, "head");
  const eff = curveInterpolant("curve", curve, "efficiency");
  return (q) => {
    if (q < eff.min || q > eff.max) return undefined;
    const e = eff.at(q);
    return e > 0 ? (density * STANDARD_GRAVITY * q * head.at(q)) / e : undefined;
  };
}

/** One corner of the envelope. Blank cells of the cases table are undefined here. */
export interface EnvelopeCase {
  label: string;
  /** Elevation of the suction surface, m. */
  suctionLevel: number;
  /** Gauge pressure on the suction surface, Pa (0 for an open tank). */
  suctionPressure: number;
  /** Elevation of the discharge (free surface or outlet), m. */
  dischargeLevel: number;
  /** Gauge pressure needed at the discharge, Pa. */
  dischargePressure: number;
  /** Absolute roughness for every segment (new or aged pipe), m; the segments' own when undefined. */
  roughness?: number;
  temperature: number;
  /** Identical pumps running in parallel. */
  pumps: number;
  /** Speed as a ratio of the curve's speed. */
  speed: number;
  /** Operating hours per year, h. */
  hours?: number;
}

interface EnvelopeSystem {
  /** Suction line of each pump, from the suction surface to its inlet. */
  suction: readonly PipeSegment[];
  /** Discharge line shared by the pumps running. */
  discharge: readonly PipeSegment[];
  /** Elevation of the impeller eye, m, on the levels' datum. */
  pumpLevel: number;
  /** Atmospheric pressure at the site, Pa absolute. */
  atmosphere: number;
}

export interface Corner {
  label: string;
  /** Set when the corner has no operating point (beyond the curve's end, or no crossing). */
  failure?: string;
  flowTotal?: number;
  flowPerPump?: number;
  head?: number;
  fractionOfBep?: number;
  efficiency?: number;
  shaftPower?: number;
  npsha?: number;
  npshr?: number;
  margin?: number;
  /** Shaft energy per year of all the pumps running, J. */
  energy?: number;
  status: "ok" | "warning" | "fails";
  reasons: string[];
}

const withRoughness = (segments: readonly PipeSegment[], roughness?: number) => (roughness === undefined ? segments : segments.map((s) => ({ ...s, roughness })));

/** One case as curves of the flow per pump: the water, the pump at the case's speed, the system head and NPSHa. */
interface CaseModel {
  density: number;
  /** Head of one pump at the case's speed, at its own flow. */
  pump: Interpolant;
  /** System head when each of the pumps running delivers `q`. */
  systemAt(q: number): number;
  /** NPSH available at a pump delivering `q` (its suction losses grow with its flow). */
  npshaAt(q: number): number;
}

export function caseModel(curve: PumpCurve, c: EnvelopeCase, system: EnvelopeSystem): CaseModel {
  const rho = waterDensity(c.temperature, system.atmosphere).value;
  const nu = waterKinematicViscosity(c.temperature, system.atmosphere).value;
  const pv = saturationPressure(c.temperature).value;
  const rhoG = rho * STANDARD_GRAVITY;
  const r = c.speed;
  const suction = { segments: withRoughness(system.suction, c.roughness), kinematicViscosity: nu };
  const discharge = { segments: withRoughness(system.discharge, c.roughness), kinematicViscosity: nu };
  const staticHead = c.dischargeLevel - c.suctionLevel + (c.dischargePressure - c.suctionPressure) / rhoG;
  const head = curveInterpolant("curve", curve, "head");
  // Checked once with their messages; the curves below are evaluated many times.
  checkSystem(0, suction);
  checkSystem(0, discharge);
  return {
    density: rho,
    pump: { min: head.min * r, max: head.max * r, at: (q) => r * r * head.at(q / r), grid: head.grid.map((q) => q * r), steps: () => [] },
    systemAt: (q) => staticHead + systemHeadAt(q, 0, suction) + systemHeadAt(c.pumps * q, 0, discharge),
    npshaAt: (q) => (system.atmosphere + c.suctionPressure - pv) / rhoG + (c.suctionLevel - system.pumpLevel) - systemHeadAt(q, 0, suction),
  };
}

/** The operating point and the checks at one corner of the envelope. */
function envelopeCorner(curve: PumpCurve, bep: Bep, limits: OperatingLimits, c: EnvelopeCase, system: EnvelopeSystem, minMargin: number, motor?: number): Corner {
  const reasons: string[] = [];
  const model = caseModel(curve, c, system);
  const rho = model.density;
  const g = STANDARD_GRAVITY;
  const r = c.speed;
  const n = c.pumps;
  const head = curveInterpolant("curve", curve, "head");
  const pump = model.pump;
  const systemAt = model.systemAt;
  let q: number;
  try {
    q = operatingPoint(pump, systemAt).value.flow;
  } catch (e) {
    if (!(e instanceof CalcError)) throw e;
    return { label: c.label, failure: e.detail, status: "fails", reasons: [e.detail] };
  }
  const h = pump.at(q);
  const region = regionOf(q, bep, limits, head, r);
  reasons.push(...region.failures);
  const efficiency = curve.efficiency ? curveInterpolant("curve", curve, "efficiency").at(q / r) : undefined;
  const power = shaftPowerFunction(curve, rho)(q / r);
  const shaftPower = power === undefined ? undefined : curve.power ? power * r ** 3 : (rho * g * q * h) / efficiency!;
  const npsha = model.npshaAt(q);
  let npshr: number | undefined;
  let margin: number | undefined;
  if (curve.npshr) {
    const f = curveInterpolant("curve", curve, "npshr");
    if (q / r >= f.min && q / r <= f.max) {
      npshr = r * r * f.at(q / r);
      margin = npsha / npshr;
      if (margin < minMargin) reasons.push(`NPSH margin ${margin.toFixed(2)} is below ${minMargin} (NPSHa ${quoted(npsha, "length")}, NPSHr ${quoted(npshr, "length")})`);
    } else reasons.push(`no NPSHr at this flow: the NPSHr column covers ${quoted(f.min * r, "flow")} to ${quoted(f.max * r, "flow")}`);
  }
  if (motor !== undefined && shaftPower !== undefined && shaftPower > motor) reasons.push(`shaft power ${quoted(shaftPower, "power")} overloads the ${quoted(motor, "power")} motor`);
  const failed = reasons.length > 0;
  if (!failed) reasons.push(...region.warnings);
  else reasons.push(...region.warnings.map((w) => `also ${w}`));
  return {
    label: c.label,
    flowTotal: n * q,
    flowPerPump: q,
    head: h,
    fractionOfBep: region.fraction,
    efficiency,
    shaftPower,
    npsha,
    npshr,
    margin,
    energy: shaftPower !== undefined && c.hours !== undefined ? n * shaftPower * c.hours * 3600 : undefined,
    status: failed ? "fails" : region.warnings.length ? "warning" : "ok",
    reasons,
  };
}

/** Every corner, with the steps a reviewer reads: the BEP and the worst corners. */
export function envelope(curve: PumpCurve, limits: OperatingLimits, cases: readonly EnvelopeCase[], system: EnvelopeSystem, minMargin: number, motor?: number, bepFlow?: number): CalcResult<{ bep: Bep; corners: Corner[] }> {
  checkLimits(limits);
  if (!(minMargin >= 1)) throw new CalcError("min_margin", `expected a margin ratio of 1 or more (1.1 is the least ANSI/HI 9.6.1 suggests); got ${minMargin}`);
  const bep = bestEfficiencyPoint(curve, bepFlow);
  const corners = cases.map((c) => envelopeCorner(curve, bep.value, limits, c, system, minMargin, motor));
  const steps: Step[] = [...(bep.steps ?? [])];
  const worst = (pick: (c: Corner) => number | undefined, better: (a: number, b: number) => boolean) =>
    corners.reduce<Corner | undefined>((w, c) => (pick(c) !== undefined && (w === undefined || better(pick(c)!, pick(w)!)) ? c : w), undefined);
  const lowMargin = worst((c) => c.margin, (a, b) => a < b);
  const highPower = worst((c) => c.shaftPower, (a, b) => a > b);
  if (lowMargin) steps.push(step("M_min", `smallest NPSH margin ratio (case ${lowMargin.label})`, lowMargin.margin!, "ratio", "NPSHa/NPSHr at each corner"));
  if (highPower) steps.push(step("P_env", `largest shaft power per pump (case ${highPower.label})`, highPower.shaftPower!, "power", "ρgQH/η at each corner"));
  const warnings = [...bep.warnings];
  if (motor !== undefined && cases.length) {
    // A motor that carries every case can still overload when the pump runs out to the end of its curve.
    const fastest = cases.reduce((a, c) => (c.speed > a.speed ? c : a));
    const end = endOfCurvePower(curve, waterDensity(fastest.temperature, system.atmosphere).value, fastest.speed).value;
    if (end.power > motor && corners.every((c) => c.shaftPower === undefined || c.shaftPower <= motor)) {
      warnings.push(`The ${quoted(motor, "power")} motor covers every case but not the end of the curve: ${quoted(end.power, "power")} at ${quoted(end.flow, "flow")}. A burst main or a tripped pump can take it there; size it for the end of the curve (NAPPE.PUMP.MAXPOWER) or limit the flow.`);
    }
  }
  const failing = corners.filter((c) => c.status === "fails");
  if (failing.length) warnings.push(`${failing.length} of ${corners.length} corners fail: ${failing.map((c) => `${c.label} (${c.reasons[0]})`).join("; ")}.`);
  const warning = corners.filter((c) => c.status === "warning");
  if (warning.length) warnings.push(`${warning.length} of ${corners.length} corners warn: ${warning.map((c) => `${c.label} (${c.reasons[0]})`).join("; ")}.`);
  return ok({ bep: bep.value, corners }, warnings, steps);
}

/** One candidate of a selection: its impeller, its corners, and the figures the table compares. */
interface Candidate {
  label: string;
  /** Why the candidate cannot be judged at all (no efficiency column, ...). */
  failure?: string;
  design?: Corner;
  corners: Corner[];
  endPower?: number;
  envelopePower?: number;
  motor?: number;
  worstMargin?: number;
  energy?: number;
  passes: boolean;
  verdict: string;
}

/**
 * Every impeller of a family over the envelope. The first case is the design duty; with a duty
 * flow, a candidate whose design case delivers less fails. Each
 * candidate's motor is the next standard rating covering both the end-of-curve power (at the
 * highest speed in the cases) and every corner. The recommended candidate passes every check
 * at every corner and has the best efficiency at the design duty; the verdict of every other
 * says why it lost.
 */
export function selectOverEnvelope(
  impellers: readonly { label: string; curve: PumpCurve }[],
  limits: OperatingLimits,
  cases: readonly EnvelopeCase[],
  system: EnvelopeSystem,
  minMargin: number,
  motorFor: (power: number) => number | undefined,
  dutyFlow?: number,
): CalcResult<Candidate[]> {
  checkLimits(limits);
  if (dutyFlow !== undefined && !(dutyFlow > 0)) throw new CalcError("duty_flow", `expected a flow above 0 that the design case must deliver (or leave it out); got ${quoted(dutyFlow, "flow")}`);
  if (!cases.length) throw new CalcError("cases", "needs at least one case (the first is the design duty)", "value");
  const fastest = Math.max(...cases.map((c) => c.speed));
  const designRho = waterDensity(cases[0].temperature, system.atmosphere).value;
  const candidates: Candidate[] = impellers.map((imp) => {
    let bep: Bep;
    try {
      bep = bestEfficiencyPoint(imp.curve).value;
    } catch (e) {
      if (!(e instanceof CalcError)) throw e;
      return { label: imp.label, failure: e.detail, corners: [], passes: false, verdict: `cannot be judged: ${e.detail}` };
    }
    const corners = cases.map((c) => envelopeCorner(imp.curve, bep, limits, c, system, minMargin));
    const powers = corners.map((c) => c.shaftPower).filter((p): p is number => p !== undefined);
    const envelopePower = powers.length ? Math.max(...powers) : undefined;
    const endPower = endOfCurvePower(imp.curve, designRho, fastest).value.power;
    const needed = Math.max(endPower, envelopePower ?? 0);
    const motor = motorFor(needed);
    const margins = corners.map((c) => c.margin).filter((m): m is number => m !== undefined);
    const energies = corners.map((c) => c.energy).filter((x): x is number => x !== undefined);
    const failing = corners.filter((c) => c.status === "fails");
    const reasons = failing.map((c) => `${c.label}: ${c.reasons[0]}`);
    if (motor === undefined) reasons.push(`no listed motor rating covers its ${quoted(needed, "power")}`);
    const design = corners[0];
    if (dutyFlow !== undefined && design.flowTotal !== undefined && design.flowTotal < dutyFlow * (1 - 1e-9)) {
      reasons.unshift(`${design.label}: delivers ${quoted(design.flowTotal, "flow")}, short of the duty ${quoted(dutyFlow, "flow")}`);
    }
    return {
      label: imp.label,
      design: corners[0],
      corners,
      endPower,
      envelopePower,
      motor,
      worstMargin: margins.length ? Math.min(...margins) : undefined,
      energy: energies.length ? energies.reduce((a, b) => a + b, 0) : undefined,
      passes: reasons.length === 0,
      verdict: reasons.length ? `fails: ${reasons.join("; ")}` : "",
    };
  });
  const passing = candidates.filter((c) => c.passes);
  const best = passing.reduce<Candidate | undefined>((b, c) => (b === undefined || (c.design!.efficiency ?? 0) > (b.design!.efficiency ?? 0) ? c : b), undefined);
  const pct = (x: number | undefined) => (x === undefined ? "?" : `${(x * 100).toFixed(1)} %`);
  for (const c of passing) {
    c.verdict =
      c === best
        ? `recommended: passes every check at every corner, with the best efficiency at the design duty (${pct(c.design!.efficiency)})`
        : `passes, but ${pct(c.design!.efficiency)} at the design duty against ${pct(best!.design!.efficiency)} for ${best!.label}`;
  }
  const warnings = best ? [] : ["No candidate passes every check at every corner: see each verdict."];
  return ok(candidates, warnings, best ? [step("η_design", `design-duty efficiency of the recommended candidate, ${best.label}`, best.design!.efficiency ?? 0, "efficiency", "PCHIP through its efficiency column")] : []);
}
