/**
 * Working with pump curves as a whole: shaft power along a curve, curves of several identical
 * pumps, and choosing the smallest impeller of a family that meets a duty. SI in and out.
 */
import { CalcError, type CalcResult, ok, step, type Step, quoted } from "./_lib/result";
import { hydraulicPower } from "./power";
import { curveInterpolant, type Impeller, type PumpCurve, valueAt } from "./pumpCurve";

/**
 * Shaft power at a flow, W: the curve's power column where it has one, otherwise ρ·g·Q·H/η from
 * its head and efficiency columns.
 */
export function pumpPowerAt(curve: PumpCurve, flow: number, density: number): CalcResult {
  if (curve.power) {
    const f = curveInterpolant("curve", curve, "power");
    return ok(valueAt("flow", "power", f, flow), [], f.steps(flow, "P", "power"));
  }
  const head = valueAt("flow", "head", curveInterpolant("curve", curve, "head"), flow);
  const efficiency = valueAt("flow", "efficiency", curveInterpolant("curve", curve, "efficiency"), flow);
  if (!(efficiency > 0)) throw new CalcError("flow", `the curve's efficiency is ${efficiency} at this flow: no power can be computed (add a Power column)`);
  const hydraulic = hydraulicPower(flow, head, density).value;
  return ok(hydraulic / efficiency, [], [
    step("H(Q)", "head on the curve at the flow", head, "length", "PCHIP through the head column"),
    step("η(Q)", "efficiency on the curve at the flow", efficiency, "efficiency", "PCHIP through the efficiency column"),
    step("P_h", "hydraulic power ρgQH", hydraulic, "power", "g = 9.80665 m/s²"),
  ]);
}

/**
 * The factor each column of a curve is multiplied by for `count` identical pumps: in parallel
 * flows and power add, in series heads and power add; efficiency and NPSHr are each pump's own.
 */
export function combineFactors(count: number, arrangement: "parallel" | "series"): CalcResult<(column: string) => number> {
  if (!(Number.isInteger(count) && count >= 1 && count <= 20)) throw new CalcError("count", `expected a whole number of pumps from 1 to 20; got ${count}`);
  const added = arrangement === "parallel" ? ["flow", "power"] : ["head", "power"];
  return ok((column) => (added.includes(column) ? count : 1), [], [
    step("n", "identical pumps running", count, "ratio", `${arrangement}: ${added.join(" and ")} × n at each point; the other columns are each pump's own`),
  ]);
}

/** The impeller chosen for a duty, with its head, efficiency and NPSHr at the duty flow (where known). */
interface ImpellerChoice {
  impeller: Impeller;
  head: number;
  efficiency?: number;
  npshr?: number;
}

/**
 * The first impeller (smallest first, as the family lists them) whose head at the duty flow
 * reaches the duty head. An error when the flow is beyond every curve or no impeller reaches it.
 */
export function selectImpeller(impellers: readonly Impeller[], flow: number, head: number): CalcResult<ImpellerChoice> {
  let reachable = false;
  const steps: Step[] = [];
  for (const impeller of impellers) {
    const curve = curveInterpolant("family", impeller.curve, "head");
    if (flow < curve.min || flow > curve.max) continue;
    reachable = true;
    const h = curve.at(flow);
    steps.push(step(`H(${impeller.label})`, `head of impeller ${impeller.label} at the duty flow`, h, "length", h < head ? "below the duty head" : "meets the duty head: chosen"));
    if (h < head) continue;
    const at = (column: "efficiency" | "npshr") => {
      if (!impeller.curve[column]) return undefined;
      const f = curveInterpolant("family", impeller.curve, column);
      return flow >= f.min && flow <= f.max ? f.at(flow) : undefined;
    };
    return ok({ impeller, head: h, efficiency: at("efficiency"), npshr: at("npshr") }, [], steps);
  }
  if (!reachable) throw new CalcError("flow", `${quoted(flow, "flow")} is outside every impeller's curve in the family (the largest reaches ${quoted(Math.max(...impellers.map((i) => curveInterpolant("family", i.curve, "head").max)), "flow")})`);
  throw new CalcError("head", `no impeller in the family gives ${quoted(head, "length")} at ${quoted(flow, "flow")}; the largest gives ${quoted(steps[steps.length - 1].value, "length")}`);
}
