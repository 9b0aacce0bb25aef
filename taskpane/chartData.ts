/**
 * Chart data for pump and system functions (pure): the pump curve's points and its evaluated
 * curve, efficiency on a second axis, the best efficiency point and the preferred operating
 * region, the system curve, the operating point, and the scaled or trimmed curve, in the units
 * of the curve table's headers. NPSHr and NPSHa go to a panel of their own, so a margin of a few
 * metres reads beside a head of a hundred. For an envelope: every case's system curve, pump
 * curve (for the pumps running and the speed) and operating point, and each case's NPSHa.
 */
import { interpolant, type PumpCurve } from "../functions/calc/pumpCurve";
import { bestEfficiencyPoint, caseModel, POR_DEFAULT } from "../functions/calc/envelope";
import { operatingPoint as crossing } from "../functions/calc/operatingPoint";
import { systemHead } from "../functions/calc/systemCurve";
import { column, type Table } from "../functions/tables/table";
import { casesFromTable, curveFromTable, impellersFromTable, segmentsFromTable, systemLosses } from "../functions/catalog/_tables";
import type { Args } from "../functions/catalog/types";
import { DIMENSIONS } from "../functions/units/dimensions";
import { fromBase, toBase } from "../functions/units/quantity";
import type { CallRecord } from "../workbook/recalc";

interface Point {
  x: number;
  y: number;
}

interface ChartSeries {
  name: string;
  /** "points": markers only; "line": a smooth line; "marker": one highlighted point. */
  style: "points" | "line" | "dashed" | "marker";
  /** Which y axis: head (left) or efficiency (right) of the main panel, or the NPSH panel. */
  axis: "head" | "efficiency" | "npsh";
  points: Point[];
}

export interface ChartData {
  title: string;
  flowUnit: string;
  headUnit: string;
  efficiencyUnit?: string;
  /** How the NPSH panel's flow axis reads: "Flow per pump" for an envelope of several pumps. */
  npshFlowLabel?: string;
  series: ChartSeries[];
  operatingPoint?: Point;
}

const CHARTED = /^(PUMP\.|SYSTEM\.|TRIM$|SPEED$|AFFINITY\.RATIO$)/;

/** True when a call's result can be drawn. */
function isCharted(id: string): boolean {
  return CHARTED.test(id);
}

interface Units {
  flow: string;
  head: string;
  efficiency: string;
}

function unitsOf(t: Table | undefined): Units {
  const unit = (role: string, fallback: string) => {
    const c = t ? column(t, role) : undefined;
    return c ? c.unit : fallback;
  };
  return { flow: unit("flow", DIMENSIONS.flow.base), head: unit("head", DIMENSIONS.length.base), efficiency: unit("efficiency", "") };
}

function toUnits(units: Units): { q: (x: number) => number; h: (x: number) => number; e: (x: number) => number } {
  const conv = (dim: "flow" | "length", unit: string) => (unit === DIMENSIONS[dim].base ? (x: number) => x : (x: number) => fromBase("chart", x, dim, unit));
  return { q: conv("flow", units.flow), h: conv("length", units.head), e: units.efficiency === "%" ? (x) => x * 100 : (x) => x };
}

function sample(from: number, to: number, n: number, f: (x: number) => number): Point[] {
  const out: Point[] = [];
  for (let i = 0; i <= n; i++) {
    const x = from + ((to - from) * i) / n;
    out.push({ x, y: f(x) });
  }
  return out;
}

/** The pump curve as points, evaluated head curve, efficiency and NPSHr, scaled by r (1 for none). */
function curveSeries(curve: PumpCurve, conv: ReturnType<typeof toUnits>, label: string, r = 1, withExtras = true): ChartSeries[] {
  const out: ChartSeries[] = [];
  const f = interpolant(curve.head);
  const pts = curve.head.x.map((x, i) => ({ x: conv.q(x * r), y: conv.h(curve.head.y[i] * r * r) }));
  out.push({ name: `${label} (points)`, style: "points", axis: "head", points: pts });
  out.push({ name: label, style: "line", axis: "head", points: sample(f.min, f.max, 60, (q) => f.at(q)).map((p) => ({ x: conv.q(p.x * r), y: conv.h(p.y * r * r) })) });
  if (withExtras && curve.efficiency) {
    const e = interpolant(curve.efficiency);
    out.push({ name: "Efficiency", style: "line", axis: "efficiency", points: sample(e.min, e.max, 60, (q) => e.at(q)).map((p) => ({ x: conv.q(p.x * r), y: conv.e(p.y) })) });
  }
  if (withExtras && curve.efficiency) out.push(...bepSeries(curve, conv, r));
  if (withExtras && curve.npshr) {
    const n = interpolant(curve.npshr);
    out.push({ name: "NPSHr", style: "dashed", axis: "npsh", points: sample(n.min, n.max, 40, (q) => n.at(q)).map((p) => ({ x: conv.q(p.x * r), y: conv.h(p.y * r * r) })) });
  }
  return out;
}

/** The BEP marker and the preferred region (70 %–120 % of BEP flow, common practice) drawn as a box up to the shutoff head. */
function bepSeries(curve: PumpCurve, conv: ReturnType<typeof toUnits>, r = 1): ChartSeries[] {
  let bep;
  try {
    bep = bestEfficiencyPoint(curve).value;
  } catch {
    return [];
  }
  const top = conv.h(Math.max(...curve.head.y) * r * r * 1.05);
  const [lo, hi] = POR_DEFAULT.map((f) => conv.q(f * bep.flow * r));
  return [
    { name: "BEP", style: "marker", axis: "head", points: [{ x: conv.q(bep.flow * r), y: conv.h(bep.head * r * r) }] },
    { name: "Preferred region (70–120 % of BEP)", style: "dashed", axis: "head", points: [{ x: lo, y: 0 }, { x: lo, y: top }, { x: hi, y: top }, { x: hi, y: 0 }] },
  ];
}

/** An envelope's cases drawn against the total flow: each case's pump curve and system curve, its operating point, and NPSHa against NPSHr per pump. */
function envelopeSeries(a: Args, curve: PumpCurve, conv: ReturnType<typeof toUnits>): ChartSeries[] {
  const system = { suction: segmentsFromTable("suction", a.suction as Table), discharge: segmentsFromTable("discharge", a.discharge as Table), pumpLevel: a.pump_level as number, atmosphere: a.atmosphere as number };
  const out: ChartSeries[] = [];
  const drawn = new Set<string>();
  for (const c of casesFromTable("cases", a.cases as Table)) {
    const m = caseModel(curve, c, system);
    const n = c.pumps;
    const key = `${n}×${c.speed}`;
    if (!drawn.has(key) && (n !== 1 || c.speed !== 1)) {
      drawn.add(key);
      const name = `${n > 1 ? `${n} pumps in parallel` : "1 pump"}${c.speed !== 1 ? ` at ${Math.round(c.speed * 100)} % speed` : ""}`;
      out.push({ name, style: "line", axis: "head", points: sample(m.pump.min, m.pump.max, 40, (q) => m.pump.at(q)).map((p) => ({ x: conv.q(n * p.x), y: conv.h(p.y) })) });
    }
    // The system curve up to a little above the pump's shutoff head: beyond it nothing can run.
    const ceiling = 1.15 * m.pump.at(m.pump.min);
    const sys = sample(0, m.pump.max, 40, (q) => m.systemAt(q));
    const shown = sys.slice(0, Math.max(2, sys.findIndex((p) => p.y > ceiling) + 1 || sys.length));
    out.push({ name: `System: ${c.label}`, style: "line", axis: "head", points: shown.map((p) => ({ x: conv.q(n * p.x), y: conv.h(p.y) })) });
    out.push({ name: `NPSHa: ${c.label}`, style: "line", axis: "npsh", points: sample(0, m.pump.max, 30, (q) => m.npshaAt(q)).map((p) => ({ x: conv.q(p.x), y: conv.h(p.y) })) });
    try {
      const q = crossing(m.pump, m.systemAt).value.flow;
      out.push({ name: `Point: ${c.label}`, style: "marker", axis: "head", points: [{ x: conv.q(n * q), y: conv.h(m.pump.at(q)) }] });
    } catch {
      // A case with no crossing has no point; its row in the table says why.
    }
  }
  return out;
}

function argsOf(rec: CallRecord): Args {
  return Object.fromEntries(rec.evaluation!.readings.map((r) => [r.name, r.value])) as Args;
}

/** Chart data for the first charted call of a cell, or undefined. */
export function chartFor(records: readonly CallRecord[]): ChartData | undefined {
  const rec = [...records].reverse().find((r) => isCharted(r.id) && r.evaluation);
  if (!rec) return undefined;
  const a = argsOf(rec);
  const ev = rec.evaluation!;
  const curveTable = (a.curve ?? a.family) as Table | undefined;
  const units = curveTable
    ? unitsOf(curveTable)
    : { flow: (a.flow_unit as string | undefined) ?? DIMENSIONS.flow.base, head: ((a.head_unit ?? a.unit) as string | undefined) ?? DIMENSIONS.length.base, efficiency: "" };
  const conv = toUnits(units);
  const series: ChartSeries[] = [];
  let operatingPoint: Point | undefined;
  let maxFlow = 0;

  if (a.curve && rec.id !== "PUMP.SCALE" && rec.id !== "PUMP.COMBINE") {
    const curve = curveFromTable("curve", a.curve as Table);
    series.push(...curveSeries(curve, conv, "Pump curve"));
    maxFlow = curve.head.x[curve.head.x.length - 1];
    if (["TRIM", "SPEED", "AFFINITY.RATIO"].includes(rec.id)) {
      const r = rec.id === "TRIM" ? recBaseResult(rec) / (a.diameter as number) : rec.id === "SPEED" ? recBaseResult(rec) / (a.speed as number) : (ev.value as number);
      series.push(...curveSeries(curve, conv, rec.id === "TRIM" ? "Trimmed curve" : rec.id === "SPEED" ? "Curve at the new speed" : "Scaled curve", r, false));
      operatingPoint = { x: conv.q(a.flow as number), y: conv.h(a.head as number) };
    }
  }
  if (rec.id === "PUMP.SCALE" || rec.id === "PUMP.COMBINE") {
    const t = a.curve as Table;
    const original = curveFromTable("curve", t);
    series.push(...curveSeries(original, conv, "Pump curve", 1, false));
    const rows = (ev.value as (number | string)[][]).slice(t.hasHeader ? 1 : 0);
    const flowCol = t.columns.findIndex((c) => c.role === "flow");
    const headCol = t.columns.findIndex((c) => c.role === "head");
    series.push({ name: rec.id === "PUMP.SCALE" ? "Scaled curve" : "Combined curve", style: "line", axis: "head", points: rows.map((r) => ({ x: Number(r[flowCol]), y: Number(r[headCol]) })) });
  }
  if (rec.id === "PUMP.SELECT" || rec.id === "PUMP.SHORTLIST") {
    for (const imp of impellersFromTable("family", a.family as Table)) series.push(...curveSeries(imp.curve, conv, `Impeller ${imp.label}`, 1, false).filter((s) => s.style === "line"));
    if (rec.id === "PUMP.SELECT") operatingPoint = { x: conv.q(a.flow as number), y: conv.h(a.head as number) };
  }
  if (["PUMP.HEAD", "PUMP.NPSHR"].includes(rec.id)) operatingPoint = { x: conv.q(a.flow as number), y: conv.h(recBaseResult(rec)) };
  if (rec.id === "PUMP.EFFICIENCY" || rec.id === "PUMP.POWER") {
    const curve = curveFromTable("curve", a.curve as Table);
    operatingPoint = { x: conv.q(a.flow as number), y: conv.h(interpolant(curve.head).at(a.flow as number)) };
  }
  if (rec.id === "PUMP.DUTY" || rec.id === "SYSTEM.HEAD" || rec.id === "SYSTEM.CURVE") {
    const losses = systemLosses((rec.id === "PUMP.DUTY" ? a.system : a.segments) as Table | number, a.kinematic_viscosity as number);
    const staticHead = a.static_head as number;
    const systemAt = (q: number) => systemHead(q, staticHead, losses).value;
    const top = rec.id === "SYSTEM.CURVE" ? (a.max_flow as number) : rec.id === "SYSTEM.HEAD" ? 1.5 * Math.max(a.flow as number, 1e-9) : maxFlow;
    series.push({ name: "System curve", style: "line", axis: "head", points: sample(0, top, 50, systemAt).map((p) => ({ x: conv.q(p.x), y: conv.h(p.y) })) });
    if (rec.id === "PUMP.DUTY") {
      const [[q, h]] = ev.value as number[][];
      const flowBase = a.flow_unit ? toBase("chart", q, "flow", a.flow_unit as string) : q;
      const headBase = a.head_unit ? toBase("chart", h, "length", a.head_unit as string) : h;
      operatingPoint = { x: conv.q(flowBase), y: conv.h(headBase) };
    }
    if (rec.id === "SYSTEM.HEAD") operatingPoint = { x: conv.q(a.flow as number), y: conv.h(recBaseResult(rec)) };
  }
  if (rec.id === "PUMP.ENVELOPE") series.push(...envelopeSeries(a, curveFromTable("curve", a.curve as Table), conv));
  if (operatingPoint) series.push({ name: "Operating point", style: "marker", axis: "head", points: [operatingPoint] });
  if (!series.length) return undefined; // nothing to draw: no empty axes
  return {
    title: `NAPPE.${rec.id}`,
    flowUnit: units.flow,
    headUnit: units.head,
    efficiencyUnit: series.some((s) => s.axis === "efficiency") ? units.efficiency || "fraction" : undefined,
    npshFlowLabel: rec.id === "PUMP.ENVELOPE" ? "Flow per pump" : undefined,
    series,
    operatingPoint,
  };
}

/** A call's scalar result in base units (undoing its `unit` argument). */
function recBaseResult(rec: CallRecord): number {
  const ev = rec.evaluation!;
  const v = ev.value as number;
  return ev.unit && ev.unit !== DIMENSIONS[ev.dim].base ? toBase("chart", v, ev.dim, ev.unit) : v;
}

/** Adds the workbook's NPSHa (base units, m) as a level line against the NPSHr curve, in the NPSH panel. */
export function withNpsha(chart: ChartData, npshaBase: number, source: string): ChartData {
  const npshr = chart.series.find((x) => x.name === "NPSHr");
  // An envelope draws each case's own NPSHa curve; the workbook's single value would mislead there.
  if (!npshr || chart.series.some((x) => x.name.startsWith("NPSHa: "))) return chart;
  const head = chart.headUnit === DIMENSIONS.length.base ? npshaBase : fromBase("chart", npshaBase, "length", chart.headUnit);
  const xs = chart.series.flatMap((x) => x.points.map((p) => p.x));
  const line: ChartSeries = { name: `NPSHa (${source})`, style: "dashed", axis: "npsh", points: [{ x: Math.min(...xs), y: head }, { x: Math.max(...xs), y: head }] };
  const at = chart.series.findIndex((x) => x.name === "NPSHr");
  return { ...chart, series: [...chart.series.slice(0, at + 1), line, ...chart.series.slice(at + 1)] };
}
