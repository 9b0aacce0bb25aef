/** The operating point: where the pump's head curve meets the system curve. */
import { CalcError, type CalcResult, ok, step, quoted } from "./_lib/result";
import { rootsOnGrid } from "./_lib/solve";
import type { Interpolant } from "./pumpCurve";

interface OperatingPoint {
  flow: number;
  head: number;
}

/**
 * Solves pump(Q) = system(Q) on the pump curve's flow range: Brent's method on every sign
 * change between the curve's own points (intervals the pump curve rises over are split, since a
 * rising system curve can cross a falling PCHIP interval only once). Where a drooping curve crosses twice, the higher flow is the
 * stable point and is returned with a warning.
 */
export function operatingPoint(pump: Interpolant, systemAt: (flow: number) => number): CalcResult<OperatingPoint> {
  const diff = (q: number) => pump.at(q) - systemAt(q);
  const roots = rootsOnGrid(diff, pump.grid);
  if (!roots.length) {
    if (diff(pump.min) < 0) {
      throw new CalcError(
        "system",
        `the system needs more head than the pump gives anywhere on its curve (at ${quoted(pump.min, "flow")}: pump ${quoted(pump.at(pump.min), "length")}, system ${quoted(systemAt(pump.min), "length")})`,
      );
    }
    throw new CalcError(
      "system",
      `the curves do not cross within the pump curve: at its last point (${quoted(pump.max, "flow")}) the pump still gives ${quoted(pump.at(pump.max), "length")} against ${quoted(systemAt(pump.max), "length")} needed, so it would run beyond the curve`,
    );
  }
  const flow = roots[roots.length - 1];
  const warnings: string[] = [];
  if (roots.length > 1) {
    warnings.push(`The curves cross ${roots.length} times (drooping head curve); the highest-flow crossing is returned. Operation near the others may be unstable.`);
  }
  return ok({ flow, head: pump.at(flow) }, warnings, [
    step("Q*", "flow where the curves cross", flow, "flow", "Brent's method on H_pump(Q) − H_system(Q) over the curve's flow range"),
    step("H_pump(Q*)", "pump head there", pump.at(flow), "length", "PCHIP through the curve's points"),
    step("H_system(Q*)", "system head there", systemAt(flow), "length", "static head plus losses"),
  ]);
}
