/**
 * Chart data for pump and system functions (pure): the pump curve's points and its evaluated
 * curve, efficiency on a second axis, NPSHr, the system curve, the operating point, and the
 * scaled or trimmed curve, in the units of the curve table's headers.
 */
import { interpolant, type PumpCurve } from "../functions/calc/pumpCurve";
import { systemHead } from "../functions/calc/systemCurve";
import { column, type Table } from "../functions/tables/table";
import { curveFromTable, impellersFromTable, systemLosses } from "../functions/catalog/_tables";
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
  /** Which y axis: head (left) or efficiency (right). */
  axis: "head" | "efficiency";
  points: Point[];
}

export interface ChartData {
  title: string;
  flowUnit: string;
  headUnit: string;
  efficiencyUnit?: string;
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
  if (withExtras && curve.npshr) {
    const n = interpolant(curve.npshr);
    out.push({ name: "NPSHr", style: "dashed", axis: "head", points: sample(n.min, n.max, 40, (q) => n.at(q)).map((p) => ({ x: conv.q(p.x * r), y: conv.h(p.y * r * r) })) });
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
  if (rec.id === "PUMP.SELECT") {
    for (const imp of impellersFromTable("family", a.family as Table)) series.push(...curveSeries(imp.curve, conv, `Impeller ${imp.label}`, 1, false).filter((s) => s.style === "line"));
    operatingPoint = { x: conv.q(a.flow as number), y: conv.h(a.head as number) };
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
  if (operatingPoint) series.push({ name: "Operating point", style: "marker", axis: "head", points: [operatingPoint] });
  return {
    title: `NAPPE.${rec.id}`,
    flowUnit: units.flow,
    headUnit: units.head,
    efficiencyUnit: series.some((s) => s.axis === "efficiency") ? units.efficiency || "fraction" : undefined,
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

/** Adds the workbook's NPSHa (base units, m) as a level line against the NPSHr curve. */
export function withNpsha(chart: ChartData, npshaBase: number, source: string): ChartData {
  const npshr = chart.series.find((x) => x.name === "NPSHr");
  if (!npshr) return chart;
  const head = chart.headUnit === DIMENSIONS.length.base ? npshaBase : fromBase("chart", npshaBase, "length", chart.headUnit);
  const xs = chart.series.flatMap((x) => x.points.map((p) => p.x));
  const line: ChartSeries = { name: `NPSHa (${source})`, style: "dashed", axis: "head", points: [{ x: Math.min(...xs), y: head }, { x: Math.max(...xs), y: head }] };
  const at = chart.series.findIndex((x) => x.name === "NPSHr");
  return { ...chart, series: [...chart.series.slice(0, at + 1), line, ...chart.series.slice(at + 1)] };
}
