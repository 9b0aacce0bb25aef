/** Turns tables read from the worksheet into the calc core's plain structures, and back. */
import { CalcError } from "../calc/_lib/result";
import { checkHeadShape, checkSeries, type Impeller, type PumpCurve, type Series } from "../calc/pumpCurve";
import { checkSegments, type PipeSegment, type SystemLosses } from "../calc/systemCurve";
import type { EnvelopeCase } from "../calc/envelope";
import { DEFAULT_TEMPERATURE_C } from "../calc/_lib/constants";
import { column, inColumnUnit, type Table } from "../tables/table";
import { DIMENSIONS } from "../units/dimensions";
import { fromBase } from "../units/quantity";
import type { Cell } from "./types";

/** Value limits of each curve column, for checks. */
const LIMITS: Record<string, [number, number, string]> = {
  head: [0, Infinity, "head"],
  efficiency: [0, 1, "efficiency"],
  npshr: [0, Infinity, "NPSHr"],
  power: [0, Infinity, "power"],
};

function seriesOf(arg: string, t: Table, rows: number[], role: string): Series | undefined {
  const flow = column(t, "flow")!;
  const col = column(t, role);
  if (!col) return undefined;
  const x: number[] = [];
  const y: number[] = [];
  for (const i of rows) {
    const q = flow.values[i];
    const v = col.values[i];
    if (q !== null && v !== null) {
      x.push(q);
      y.push(v);
    }
  }
  if (!x.length) return undefined;
  const [lo, hi, what] = LIMITS[role];
  return checkSeries(arg, what, x, y, lo, hi);
}

/** A pump curve from the rows `rows` of a curve or family table. */
function curveFromRows(arg: string, t: Table, rows: number[]): PumpCurve {
  const head = seriesOf(arg, t, rows, "head")!;
  checkHeadShape(arg, head);
  return { head, efficiency: seriesOf(arg, t, rows, "efficiency"), npshr: seriesOf(arg, t, rows, "npshr"), power: seriesOf(arg, t, rows, "power") };
}

/** Curves already built from a table (tables are read once per content, see readTable). */
const curves = new WeakMap<Table, Map<string, PumpCurve>>();

export function curveFromTable(arg: string, t: Table): PumpCurve {
  let byArg = curves.get(t);
  if (!byArg) curves.set(t, (byArg = new Map()));
  let curve = byArg.get(arg);
  if (!curve) byArg.set(arg, (curve = curveFromRows(arg, t, [...Array(t.rows).keys()])));
  return curve;
}


export function segmentsFromTable(arg: string, t: Table): PipeSegment[] {
  const get = (role: string) => column(t, role);
  const k = get("k");
  const segments = [...Array(t.rows).keys()].map((i) => ({
    length: get("length")!.values[i]!,
    diameter: get("diameter")!.values[i]!,
    roughness: get("roughness")!.values[i]!,
    k: k?.values[i] ?? 0,
  }));
  checkSegments(arg, segments);
  return segments;
}

/** The `system` argument: a resistance k (number) or a segments table. */
export function systemLosses(system: Table | number, kinematicViscosity: number): SystemLosses {
  if (typeof system === "number") return { k: system };
  return { segments: segmentsFromTable("system", system), kinematicViscosity };
}


/** Groups a family table's rows by impeller; sized impellers smallest first, labels in the order listed. */
export function impellersFromTable(arg: string, t: Table): Impeller[] {
  const imp = column(t, "impeller")!;
  const groups = new Map<string, number[]>();
  for (let i = 0; i < t.rows; i++) {
    const key = imp.labels[i] ?? String(imp.values[i]);
    groups.set(key, [...(groups.get(key) ?? []), i]);
  }
  const impellers = [...groups.entries()].map(([key, rows]) => {
    const size = imp.labels[rows[0]] === null ? imp.values[rows[0]] : null;
    const label = size === null ? key : String(Number(inColumnUnit(imp, size).toPrecision(10)));
    try {
      return { size, label, curve: curveFromRows(arg, t, rows) };
    } catch (e) {
      if (e instanceof CalcError) throw new CalcError(arg, `impeller ${label}: ${e.detail}`, e.kind);
      throw e;
    }
  });
  if (impellers.length < 1) throw new CalcError(arg, "holds no impeller curves", "value");
  if (impellers.every((i) => i.size !== null)) impellers.sort((p, q) => p.size! - q.size!);
  return impellers;
}

/** Writes a table back with each column's values transformed, in the table's own units and header. */
export function spillTable(t: Table, transform: (role: string, value: number) => number): Cell[][] {
  const rows: Cell[][] = [];
  if (t.hasHeader) rows.push(t.columns.map((c) => c.header ?? c.role));
  for (let i = 0; i < t.rows; i++) {
    rows.push(
      t.columns.map((c) => {
        const v = c.values[i];
        if (v === null) return c.labels[i] ?? "";
        return inColumnUnit(c, transform(c.role, v));
      }),
    );
  }
  return rows;
}

/** Header for a spilled column: "Flow (gpm)", or "Flow (m³/s)" in base units. */
export function spillHeader(name: string, unit: string | undefined, base: keyof typeof DIMENSIONS): string {
  return `${name} (${unit ?? DIMENSIONS[base].base})`;
}

/** One value of a spilled result in the unit its argument asks for (the base unit when left out). */
export function spillValue(arg: string, value: number, dim: keyof typeof DIMENSIONS, unit: string | undefined): number {
  return unit ? fromBase(arg, value, dim, unit) : value;
}

/** The cases of an envelope, one per row; blank optional cells take the usual values (open tanks, 20 °C, one pump at the curve's speed). */
export function casesFromTable(arg: string, t: Table): EnvelopeCase[] {
  const get = (role: string, i: number) => column(t, role)?.values[i] ?? undefined;
  const cases = [...Array(t.rows).keys()].map((i) => {
    const name = column(t, "case");
    const label = name ? (name.labels[i] ?? (name.values[i] !== null ? String(name.values[i]) : `case ${i + 1}`)) : `case ${i + 1}`;
    const c: EnvelopeCase = {
      label,
      suctionLevel: get("suctionLevel", i)!,
      suctionPressure: get("suctionPressure", i) ?? 0,
      dischargeLevel: get("dischargeLevel", i)!,
      dischargePressure: get("dischargePressure", i) ?? 0,
      roughness: get("roughness", i),
      temperature: get("temperature", i) ?? DEFAULT_TEMPERATURE_C,
      pumps: get("pumps", i) ?? 1,
      speed: get("speed", i) ?? 1,
      hours: get("hours", i),
    };
    const where = `case ${label} (row ${i + 1 + t.headerRows})`;
    if (!(Number.isInteger(c.pumps) && c.pumps >= 1 && c.pumps <= 20)) throw new CalcError(arg, `${where}: pumps running must be a whole number from 1 to 20; got ${c.pumps}`, "value");
    if (!(c.speed > 0.2 && c.speed <= 2)) throw new CalcError(arg, `${where}: speed is a ratio to the curve's speed (1 = the curve's), from above 0.2 to 2; got ${c.speed}`, "value");
    if (c.roughness !== undefined && !(c.roughness >= 0)) throw new CalcError(arg, `${where}: roughness must be zero or more; got ${c.roughness}`, "value");
    if (c.hours !== undefined && !(c.hours >= 0 && c.hours <= 8784)) throw new CalcError(arg, `${where}: hours per year must be from 0 to 8784; got ${c.hours}`, "value");
    return c;
  });
  if (!cases.length) throw new CalcError(arg, "needs at least one case row", "value");
  return cases;
}
