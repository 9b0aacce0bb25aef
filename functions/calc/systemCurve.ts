/**
 * System head: static head plus the losses of each pipe segment,
 * H = Hs + Σ (f·L/D + ΣK)·V²/2g (Darcy–Weisbach with Colebrook), or H = Hs + k·Q².
 */
import { type CalcResult, CalcError, ok, requireFinite, requireNonNegative, step, type Step } from "./_lib/result";
import { colebrookFriction, frictionFactor } from "./friction";
import { velocityHead } from "./headLoss";
import { pipeArea } from "./pipeFlow";

/** One run of pipe of one size: length, inside diameter, absolute roughness, sum of K. */
export interface PipeSegment {
  length: number;
  diameter: number;
  roughness: number;
  k: number;
}

/** How the system's losses are described: a resistance k (H = Hs + kQ²) or pipe segments. */
export type SystemLosses = { k: number } | { segments: readonly PipeSegment[]; kinematicViscosity: number };

/** Checks segment values; `arg` names the table. */
export function checkSegments(arg: string, segments: readonly PipeSegment[]): void {
  if (!segments.length) throw new CalcError(arg, "needs at least one pipe segment (length, inside diameter, roughness, K)", "value");
  segments.forEach((s, i) => {
    const where = `segment ${i + 1}`;
    if (!(s.length >= 0)) throw new CalcError(arg, `${where}: length must be zero or more; got ${s.length}`);
    if (!(s.diameter > 0)) throw new CalcError(arg, `${where}: inside diameter must be greater than zero; got ${s.diameter}`);
    if (!(s.roughness >= 0 && s.roughness < 0.5 * s.diameter)) throw new CalcError(arg, `${where}: roughness must be zero or more and well below the diameter; got ${s.roughness}`);
    if (!(s.k >= 0)) throw new CalcError(arg, `${where}: K must be zero or more; got ${s.k}`);
  });
}

/** Checks a system's static head and losses, with the messages systemHead gives. */
export function checkSystem(staticHead: number, losses: SystemLosses): void {
  requireFinite("static_head", staticHead);
  if ("k" in losses) {
    if (!(losses.k >= 0)) throw new CalcError("system", `expected a resistance k of zero or more (H = Hs + k·Q², k in s²/m⁵); got ${losses.k}`);
  } else if (!(losses.kinematicViscosity > 0 && Number.isFinite(losses.kinematicViscosity))) {
    throw new CalcError("kinematic_viscosity", `expected a kinematic viscosity greater than zero; got ${losses.kinematicViscosity}`);
  }
}

/** Sum of friction and minor losses of the segments at a flow, m. */
function segmentLosses(flow: number, segments: readonly PipeSegment[], kinematicViscosity: number): CalcResult {
  const warnings = new Set<string>();
  let total = 0;
  if (flow === 0) return ok(0);
  const steps: Step[] = [];
  segments.forEach((s, i) => {
    const v = flow / pipeArea(s.diameter);
    const re = (v * s.diameter) / kinematicViscosity;
    const f = frictionFactor(re, s.roughness / s.diameter);
    f.warnings.forEach((w) => warnings.add(w));
    const loss = ((f.value * s.length) / s.diameter + s.k) * velocityHead(v);
    total += loss;
    const n = segments.length > 1 ? `${i + 1}` : "";
    steps.push(
      step(`V${n}`, `mean velocity${n ? `, segment ${n}` : ""}`, v, "velocity", "continuity, V = 4Q/(πD²)"),
      step(`Re${n}`, `Reynolds number${n ? `, segment ${n}` : ""}`, re, "ratio", "Re = VD/ν"),
      step(`f${n}`, `Darcy friction factor${n ? `, segment ${n}` : ""}`, f.value, "ratio", re < 2000 ? "64/Re (laminar)" : "Colebrook, solved to double precision"),
      step(`h${n}`, `loss${n ? `, segment ${n}` : ""}: (fL/D + ΣK)·V²/2g`, loss, "length", "Darcy–Weisbach plus loss coefficients"),
    );
  });
  return ok(total, [...warnings], steps);
}

/**
 * System head at a flow, m, and nothing else: for root finding, where every evaluation counts
 * (no checks, steps or warnings: call checkSystem first; the same numbers as systemHead).
 */
export function systemHeadAt(flow: number, staticHead: number, losses: SystemLosses): number {
  if ("k" in losses) return staticHead + losses.k * flow * flow;
  let total = staticHead;
  if (flow === 0) return total;
  for (const s of losses.segments) {
    const v = flow / pipeArea(s.diameter);
    const re = (v * s.diameter) / losses.kinematicViscosity;
    const f = re < 2000 ? 64 / re : colebrookFriction(re, s.roughness / s.diameter);
    total += ((f * s.length) / s.diameter + s.k) * velocityHead(v);
  }
  return total;
}

/** System head at a flow, m. */
export function systemHead(flow: number, staticHead: number, losses: SystemLosses): CalcResult {
  requireNonNegative("flow", flow, "a flow of zero or more");
  checkSystem(staticHead, losses);
  if ("k" in losses) {
    return ok(staticHead + losses.k * flow * flow, [], [step("H_s", "static head", staticHead, "length", "as given"), step("kQ²", "losses", losses.k * flow * flow, "length", "resistance k times the flow squared")]);
  }
  const loss = segmentLosses(flow, losses.segments, losses.kinematicViscosity);
  return ok(staticHead + loss.value, loss.warnings, [step("H_s", "static head", staticHead, "length", "as given"), ...(loss.steps ?? []), step("Σh", "all losses", loss.value, "length", "sum over the segments")]);
}

/** System curve at `points` flows evenly from 0 to maxFlow: rows of [flow, head] in m³/s and m. */
export function systemCurve(staticHead: number, losses: SystemLosses, maxFlow: number, points: number): CalcResult<[number, number][]> {
  if (!(maxFlow > 0 && Number.isFinite(maxFlow))) throw new CalcError("max_flow", `expected a flow greater than zero; got ${maxFlow}`);
  if (!(Number.isInteger(points) && points >= 2 && points <= 1000)) throw new CalcError("points", `expected a whole number of points from 2 to 1000; got ${points}`);
  const warnings = new Set<string>();
  const rows: [number, number][] = [];
  for (let i = 0; i < points; i++) {
    const q = (maxFlow * i) / (points - 1);
    const h = systemHead(q, staticHead, losses);
    h.warnings.forEach((w) => warnings.add(w));
    rows.push([q, h.value]);
  }
  const last = rows[rows.length - 1];
  return ok(rows, [...warnings], [step("H_s", "static head (zero flow)", staticHead, "length", "as given"), step("H(Q_max)", "system head at the largest flow", last[1], "length", "static head plus losses")]);
}
