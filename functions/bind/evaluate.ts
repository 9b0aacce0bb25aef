/**
 * Runs a worksheet function from its spec: reads each raw worksheet argument into base units
 * (or a choice, or a unit name), calls the calc core, and converts the result to the requested
 * unit. Pure: no Office, no DOM. The worksheet binding and the pane both use it.
 */
import { CalcError, type Step, unquote } from "../calc/_lib/result";
import type { Args, Cell, FunctionSpec, ParamSpec } from "../catalog/types";
import { resultDimension } from "../catalog/types";
import { type Dimension, DIMENSIONS, hasUnit } from "../units/dimensions";
import { fromBase, parseNumberText, parseQuantity } from "../units/quantity";
import { type RawArg, readTable, type Table } from "../tables/table";

/** A value as Excel hands it to a custom function. */
export type { RawArg };

/** How one argument was read, for the pane and the audit. */
export interface ArgReading {
  name: string;
  raw: RawArg;
  /** Base-unit number, choice word, unit name or table. */
  value: number | string | Table;
  /** Unit the argument was read in ("" for plain numbers and words). */
  unit: string;
  how: "base unit" | "text quantity" | "percent" | "default" | "word" | "unit name" | "table";
}

export interface Evaluation {
  /** The result in `unit`. */
  value: number | Cell[][];
  /** The result in the base unit of its dimension, before any `unit` argument converts it. */
  base: number | Cell[][];
  /** Result dimension and the unit the value is expressed in. */
  dim: Dimension;
  unit: string;
  warnings: string[];
  readings: ArgReading[];
  /** The calculation's intermediate values, in base units. */
  steps: Step[];
  /** A spilled result's column labels with units, when it has no header row of its own. */
  header?: string[];
}

const MAX_TEXT = 200;

function describeParam(p: ParamSpec): string {
  switch (p.kind) {
    case "quantity":
      return hasUnit(p.dim)
        ? `${DIMENSIONS[p.dim].noun}: a bare number in ${DIMENSIONS[p.dim].baseLabel} or text such as ${DIMENSIONS[p.dim].example}`
        : `${DIMENSIONS[p.dim].noun} such as ${DIMENSIONS[p.dim].example}`;
    case "choice":
      return `one of ${p.options.map((o) => `"${o}"`).join(", ")}`;
    case "unit":
      return 'a unit name such as "ft" or "kPa"';
    case "text":
      return "a name or number from the list in the function's description";
    case "anyQuantity":
      return "a number or text quantity";
    case "table":
      return p.scalar ? `${DIMENSIONS[p.scalar].noun} or a range holding a ${p.table} table` : `a range holding a ${p.table} table`;
  }
}

function isMissing(raw: RawArg): boolean {
  return raw === null || raw === undefined || (typeof raw === "string" && raw.trim() === "");
}

/** A single cell's value from a scalar argument; a 1×1 range is unwrapped. */
function scalar(p: ParamSpec, raw: RawArg): Exclude<RawArg, RawArg[][]> {
  if (Array.isArray(raw)) {
    if (raw.length === 1 && Array.isArray(raw[0]) && raw[0].length === 1 && !Array.isArray(raw[0][0])) return raw[0][0] as Exclude<RawArg, RawArg[][]>;
    throw new CalcError(p.name, `expected a single value, got a range: ${describeParam(p)}`, "value");
  }
  return raw;
}

/** The value of a lone number or a one-cell range holding one, else undefined. */
function singleValue(raw: RawArg): number | string | undefined {
  const v = Array.isArray(raw) && raw.length === 1 && Array.isArray(raw[0]) && raw[0].length === 1 ? raw[0][0] : raw;
  if (typeof v === "number") return v;
  if (typeof v === "string" && parseNumberText(v) !== undefined) return v;
  return undefined;
}

function readQuantity(p: ParamSpec, raw: number | string | boolean, dim: Dimension): ArgReading {
  if (typeof raw === "boolean") throw new CalcError(p.name, `expected ${describeParam(p)}; got ${String(raw).toUpperCase()}`, "value");
  if (typeof raw === "number") {
    if (!Number.isFinite(raw)) throw new CalcError(p.name, `expected a finite number; got ${raw}`, "num");
    if (dim === "efficiency" && raw > 1) {
      throw new CalcError(p.name, `expected a fraction from 0 to 1 (0.78) or percent text ("78%"); got ${raw}, which is not divided by 100 for you`, "num");
    }
    return { name: p.name, raw, value: raw, unit: DIMENSIONS[dim].base, how: "base unit" };
  }
  if (raw.length > MAX_TEXT) throw new CalcError(p.name, `text of ${raw.length} characters is too long for ${DIMENSIONS[dim].noun}`, "value");
  const q = parseQuantity(p.name, raw, dim);
  if (q.unit === "" && dim === "efficiency" && q.base > 1) {
    throw new CalcError(p.name, `expected a fraction from 0 to 1 (0.78) or percent text ("78%"); got ${raw}, which is not divided by 100 for you`, "num");
  }
  return {
    name: p.name,
    raw,
    value: q.base,
    unit: q.unit === "" ? DIMENSIONS[dim].base : q.unit,
    how: q.unit === "" ? "base unit" : q.unit === "%" ? "percent" : "text quantity",
  };
}

function readWord(p: ParamSpec, raw: number | string | boolean): string {
  if (typeof raw !== "string") throw new CalcError(p.name, `expected ${describeParam(p)}; got ${String(raw)}`, "value");
  if (raw.length > MAX_TEXT) throw new CalcError(p.name, `text of ${raw.length} characters is too long: expected ${describeParam(p)}`, "value");
  return raw.trim();
}

/** Reads every argument of `spec` from raw worksheet values. */
function readArgs(spec: FunctionSpec, rawArgs: readonly RawArg[]): { args: Args; readings: ArgReading[] } {
  if (rawArgs.length > spec.params.length) {
    throw new CalcError(spec.id, `takes at most ${spec.params.length} arguments; got ${rawArgs.length}`, "value");
  }
  const args: Record<string, Args[string]> = {};
  const readings: ArgReading[] = [];
  const deferred: ParamSpec[] = [];
  // Arguments whose dimension depends on others are read last.
  const indices = spec.params.map((_, i) => i);
  indices.sort((i, j) => Number(spec.params[i].kind === "anyQuantity") - Number(spec.params[j].kind === "anyQuantity"));
  for (const i of indices) {
    const p = spec.params[i];
    if (p.kind === "table") {
      if (isMissing(rawArgs[i])) throw new CalcError(p.name, `is required: expected ${describeParam(p)}`, "value");
      const single = singleValue(rawArgs[i]);
      if (p.scalar && single !== undefined) {
        const reading = readQuantity(p, single, p.scalar);
        args[p.name] = reading.value;
        readings.push(reading);
        continue;
      }
      const table = readTable(p.name, p.table, rawArgs[i]);
      args[p.name] = table;
      readings.push({ name: p.name, raw: rawArgs[i], value: table, unit: "", how: "table" });
      continue;
    }
    const raw = scalar(p, rawArgs[i]);
    if (isMissing(raw)) {
      if (!p.optional) throw new CalcError(p.name, `is required: expected ${describeParam(p)}`, "value");
      deferred.push(p);
      continue;
    }
    const reading = readOne(p, raw as number | string | boolean, args);
    args[p.name] = reading.value;
    readings.push(reading);
  }
  for (const p of deferred) {
    if ((p.kind === "quantity" || p.kind === "choice") && p.default !== undefined) {
      const value = typeof p.default === "function" ? p.default(args) : p.default;
      args[p.name] = value;
      readings.push({ name: p.name, raw: null, value, unit: p.kind === "quantity" ? DIMENSIONS[p.dim].base : "", how: "default" });
    }
  }
  const order = new Map(spec.params.map((p, i) => [p.name, i]));
  readings.sort((a, b) => (order.get(a.name) ?? 0) - (order.get(b.name) ?? 0));
  return { args, readings };
}

function readOne(p: Exclude<ParamSpec, { kind: "table" }>, raw: number | string | boolean, args: Args): ArgReading {
  switch (p.kind) {
    case "quantity":
      return readQuantity(p, raw, p.dim);
    case "anyQuantity":
      return readQuantity(p, raw, p.dimFrom(args));
    case "choice": {
      const word = readWord(p, raw).toLowerCase();
      if (!p.options.includes(word)) throw new CalcError(p.name, `unknown option "${word}": expected ${describeParam(p)}`, "value");
      return { name: p.name, raw, value: word, unit: "", how: "word" };
    }
    case "unit": {
      const word = readWord(p, raw);
      return { name: p.name, raw, value: word, unit: "", how: "unit name" };
    }
    case "text": {
      const word = readWord(p, typeof raw === "number" && Number.isFinite(raw) ? String(raw) : raw);
      return { name: p.name, raw, value: word, unit: "", how: "word" };
    }
  }
}

/** Unit names of the US customary system, as users write them. */
const US_CUSTOMARY = /^(gpm|gal\/min|MGD|cfs|cfm|ft|feet|foot|in|inch|inches|ftH2O|inH2O|psi|psia|ft\/s|ft\^3\/s|hp|lb\/ft\^3|ft\^2\/s|degF|°F)$/i;
const US_DEFAULTS: Partial<Record<Dimension, string>> = { length: "ft", flow: "gpm", velocity: "ft/s", pressure: "psi", power: "hp", density: "lb/ft^3", kinematicViscosity: "ft^2/s" };

/**
 * Rewrites the quantities a calc message marks (calc/_lib/result.ts, `quoted`) in the unit the
 * user gave for that kind of quantity: a text quantity's unit, a table column's header unit, or
 * the `unit` argument for the result's own dimension; the base unit otherwise.
 */
function userUnits(readings: readonly ArgReading[], spec: FunctionSpec, args: Args): (text: string) => string {
  const units = new Map<Dimension, string>();
  // A spilled table's own unit arguments first: its verdicts read in the units of its columns.
  for (const [name, dim] of [["flow_unit", "flow"], ["head_unit", "length"], ["power_unit", "power"]] as const) {
    const u = args[name];
    if (typeof u === "string" && spec.params.some((p) => p.name === name)) units.set(dim, u);
  }
  // Text quantities first; then the flow, head, NPSHr and power columns of tables (not an impeller's size or a pipe's bore).
  for (const r of readings) {
    const p = spec.params.find((x) => x.name === r.name);
    if (r.how === "text quantity" && p?.kind === "quantity" && !units.has(p.dim)) units.set(p.dim, r.unit);
  }
  for (const r of readings) {
    if (r.how !== "table") continue;
    for (const c of (r.value as Table).columns) if (c.header && ["flow", "head", "npshr", "power"].includes(c.role) && !units.has(c.dim)) units.set(c.dim, c.unit);
  }
  const out = args["unit"];
  if (typeof out === "string" && !spec.result.spill) {
    const dim = typeof spec.result.dim === "string" ? spec.result.dim : undefined;
    if (dim && !units.has(dim)) units.set(dim, out);
  }
  // A call in US customary units says the rest in them too: a velocity in ft/s, not m/s, on a gpm/ft sheet.
  if ([...units.values()].some((u) => US_CUSTOMARY.test(u.trim()))) for (const [dim, u] of Object.entries(US_DEFAULTS) as [Dimension, string][]) if (!units.has(dim)) units.set(dim, u);
  return (text) =>
    unquote(text, (value, dim) => {
      const unit = units.get(dim);
      if (unit) {
        try {
          return `${Number(fromBase("unit", value, dim, unit).toPrecision(4))} ${unit}`;
        } catch {
          // An odd unit text: fall back to the base unit.
        }
      }
      return `${Number(value.toPrecision(4))} ${DIMENSIONS[dim].baseLabel}`.trimEnd();
    });
}

/** Evaluates a function from raw worksheet arguments. Throws CalcError on bad input. */
export function evaluate(spec: FunctionSpec, rawArgs: readonly RawArg[]): Evaluation {
  const { args, readings } = readArgs(spec, rawArgs);
  const inUserUnits = userUnits(readings, spec, args);
  let result: ReturnType<FunctionSpec["compute"]>;
  try {
    result = spec.compute(args);
  } catch (e) {
    if (e instanceof CalcError) {
      // "got -0.1016" for a diameter typed "-4 in": the value as the user typed it.
      const r = readings.find((x) => x.name === e.arg && x.how === "text quantity" && typeof x.value === "number");
      const detail = r ? e.detail.replace(/got (-?[\d.]+(?:e[-+]?\d+)?)( \S+)?$/, (m, n: string) => (Math.abs(Number(n) - (r.value as number)) <= 1e-12 * Math.abs(r.value as number) ? `got ${String(r.raw).trim()}` : m)) : e.detail;
      throw new CalcError(e.arg, inUserUnits(detail), e.kind);
    }
    throw e;
  }
  result = { ...result, warnings: result.warnings.map(inUserUnits) };
  const dim = resultDimension(spec, args);
  if (spec.result.spill || typeof result.value !== "number") {
    if (typeof result.value === "number") throw new Error(`${spec.id} is declared as spilling but returned a number`);
    for (const row of result.value) for (const cell of row) if (typeof cell === "number" && !Number.isFinite(cell)) throw new CalcError("result", "is not a finite number for these inputs", "num");
    // Text cells (a verdict) may quote quantities: in the user's units too.
    const cells = result.value.map((row) => row.map((cell) => (typeof cell === "string" ? inUserUnits(cell) : cell)));
    const header = spec.result.columns?.(args);
    return { value: cells, base: cells, dim, unit: "", warnings: result.warnings, readings, steps: result.steps ?? [], ...(header ? { header } : {}) };
  }
  let value = result.value;
  let unit: string = DIMENSIONS[dim].base;
  const outUnit = args["unit"];
  if (typeof outUnit === "string" && spec.params.some((p) => p.name === "unit" && p.kind === "unit")) {
    if (!hasUnit(dim)) {
      throw new CalcError("unit", `this result is a plain number and takes no unit; leave unit out (got "${outUnit}")`, "value");
    }
    value = fromBase("unit", value, dim, outUnit);
    unit = outUnit;
  }
  if (!Number.isFinite(value)) throw new CalcError("result", "is not a finite number for these inputs", "num");
  return { value, base: result.value, dim, unit, warnings: result.warnings, readings, steps: result.steps ?? [] };
}
