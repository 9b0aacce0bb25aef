/**
 * Reading worksheet ranges as tables (pump curves, pipe segments, impeller families).
 * An optional header row names each column and declares its unit: `Flow (gpm)`, `Head [ft]`,
 * `Eff (%)`. Without a header the columns are positional and in base units. Cells may hold
 * numbers or text quantities. Blank trailing rows are ignored.
 */
import { CalcError } from "../calc/_lib/result";
import { type Dimension, DIMENSIONS } from "../units/dimensions";
import { parseNumberText, parseQuantity, toBase, fromBase } from "../units/quantity";

/** A worksheet argument as Excel passes it: a number, text, a logical, empty, or a range of them. */
export type RawArg = number | string | boolean | null | undefined | readonly (readonly RawArg[])[];

const TABLE_KINDS = ["curve", "segments", "family", "cases"] as const;
export type TableKind = (typeof TABLE_KINDS)[number];

interface RoleSpec {
  role: string;
  dim: Dimension;
  required: boolean;
  /** Header names that mean this column (matched on the name before any unit). */
  names: RegExp;
  /** One line for messages and docs. */
  label: string;
  /** Label cells (text that is not a quantity) allowed, as for impeller names. */
  labels?: boolean;
}

const FLOW: RoleSpec = { role: "flow", dim: "flow", required: true, names: /^(flow|q|capacity|rate|discharge)$/i, label: "Flow" };
const HEAD: RoleSpec = { role: "head", dim: "length", required: true, names: /^(head|h|tdh|total head)$/i, label: "Head" };
const EFF: RoleSpec = { role: "efficiency", dim: "efficiency", required: false, names: /^(eff|efficiency|eta|η)$/i, label: "Eff" };
const NPSHR: RoleSpec = { role: "npshr", dim: "length", required: false, names: /^(npshr|npsh|npsh3|npshre?q)$/i, label: "NPSHr" };
const POWER: RoleSpec = { role: "power", dim: "power", required: false, names: /^(power|p|bhp|shaft power)$/i, label: "Power" };

/** Columns of each kind of table, in positional order. */
const TABLE_ROLES: Record<TableKind, RoleSpec[]> = {
  curve: [FLOW, HEAD, EFF, NPSHR, POWER],
  segments: [
    { role: "length", dim: "length", required: true, names: /^(length|l|len)$/i, label: "Length" },
    { role: "diameter", dim: "length", required: true, names: /^(id|d|diameter|inside diameter|bore)$/i, label: "ID" },
    { role: "roughness", dim: "length", required: true, names: /^(roughness|rough|e|ε|eps|epsilon)$/i, label: "Roughness" },
    { role: "k", dim: "ratio", required: false, names: /^(k|sum k|σk|Σk|k total|minor)$/i, label: "K" },
  ],
  cases: [
    { role: "case", dim: "ratio", required: false, names: /^(case|corner|name|condition)$/i, label: "Case", labels: true },
    { role: "suctionLevel", dim: "length", required: true, names: /^(suction level|suction surface|suction elevation|suction el|low level|z_?s)$/i, label: "Suction level" },
    { role: "suctionPressure", dim: "pressure", required: false, names: /^(suction pressure|suction gauge|p_?s)$/i, label: "Suction pressure" },
    { role: "dischargeLevel", dim: "length", required: true, names: /^(discharge level|discharge elevation|discharge el|delivery level|outlet level|z_?d)$/i, label: "Discharge level" },
    { role: "dischargePressure", dim: "pressure", required: false, names: /^(discharge pressure|delivery pressure|outlet pressure|p_?d)$/i, label: "Discharge pressure" },
    { role: "roughness", dim: "length", required: false, names: /^(roughness|pipe roughness|ε|e|eps)$/i, label: "Roughness" },
    { role: "temperature", dim: "temperature", required: false, names: /^(temperature|temp|water temperature|t)$/i, label: "Temperature" },
    { role: "pumps", dim: "ratio", required: false, names: /^(pumps|pumps running|running|number of pumps)$/i, label: "Pumps" },
    { role: "speed", dim: "ratio", required: false, names: /^(speed|speed ratio|relative speed)$/i, label: "Speed" },
    { role: "hours", dim: "time", required: false, names: /^(hours|hours per year|operating hours|running hours|h\/yr)$/i, label: "Hours" },
  ],
  family: [{ role: "impeller", dim: "length", required: true, names: /^(impeller|imp|dia|diameter|d|trim|size)$/i, label: "Impeller", labels: true }, FLOW, HEAD, EFF, NPSHR, POWER],
};

/** One column read into base units. `values` has null where a cell was blank. */
interface TableColumn {
  role: string;
  dim: Dimension;
  /** Header text as written, or undefined for a positional column. */
  header?: string;
  /** Unit the column's bare numbers were read in ("%" for percent; base unit otherwise). */
  unit: string;
  values: (number | null)[];
  /** Text labels (impeller names) where cells were labels, else null. */
  labels: (string | null)[];
  /** Position of the column in the range (0 for the first). */
  index: number;
  /** Where the unit was read: the header cell, the units row under it, or none (the base unit). */
  unitFrom: UnitSource;
}

type UnitSource = "header" | "units row" | "base unit";

export interface Table {
  kind: TableKind;
  hasHeader: boolean;
  /** Rows above the data: 0, 1 (names) or 2 (names, then units). */
  headerRows: number;
  rows: number;
  columns: TableColumn[];
}

const MAX_ROWS = 10000;

function isBlank(v: RawArg): boolean {
  return v === null || v === undefined || (typeof v === "string" && v.trim() === "");
}

/** A column name as matched: trailing dots and spaces dropped ("Eff." is "Eff"). */
const bareName = (name: string) => name.trim().replace(/[.\s]+$/, "");

/**
 * A header cell's name and unit, in any of the layouts engineers use: `Flow (gpm)`, `Head [ft]`,
 * `Flow, gpm`, `Q gpm`, `Eff. %`, or a name alone. For the last two forms the name must be one
 * the table knows, so that a unit is never guessed out of an unknown header.
 */
function splitHeader(cell: string, roles: readonly RoleSpec[]): { name: string; unit: string } {
  const text = cell.trim();
  const bracketed = /^(.*?)\s*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(text);
  if (bracketed) return { name: bareName(bracketed[1]), unit: bracketed[2].trim() };
  const comma = /^([^,]+?)\s*,\s*(.+)$/.exec(text);
  if (comma) return { name: bareName(comma[1]), unit: comma[2].trim() };
  if (roles.some((r) => r.names.test(bareName(text)))) return { name: bareName(text), unit: "" };
  // "Q gpm", "NPSHr ft", "Shaft power kW", "Eff.%": a known name, then the unit.
  for (const m of text.matchAll(/[\s.]+|(?=%)/g)) {
    const name = bareName(text.slice(0, m.index));
    const unit = text.slice(m.index! + m[0].length).trim();
    if (name && unit && roles.some((r) => r.names.test(name))) return { name, unit };
  }
  return { name: bareName(text), unit: "" };
}

function isHeaderRow(row: readonly RawArg[], roles: RoleSpec[]): boolean {
  if (row.some((c) => typeof c === "number")) return false;
  return row.some((c) => typeof c === "string" && roles.some((r) => r.names.test(splitHeader(c, roles).name)));
}

/** A row of units under the names row (`gpm`, `ft`, `%`): text only, no numbers, at least one unit. */
function isUnitsRow(row: readonly RawArg[] | undefined): boolean {
  if (!row || row.every(isBlank)) return false;
  return row.every((c) => isBlank(c) || (typeof c === "string" && parseNumberText(c) === undefined && !/\d\s*[A-Za-z%]/.test(c)));
}

/**
 * Tables already read, by argument, kind and content: a workbook passes the same curve or pipe
 * table to many formulas, and Excel hands each call a fresh copy. Tables are never changed
 * after reading, so one read serves every call. Bounded; the oldest entry goes first.
 */
const tableCache = new Map<string, Table>();
const TABLE_CACHE_LIMIT = 200;
/** Ranges above this many cells are read every time (their key would cost as much as reading). */
const CACHED_CELLS = 5000;

/** Reads a worksheet range as a table of the given kind; `arg` names the argument in errors. */
export function readTable(arg: string, kind: TableKind, raw: RawArg): Table {
  const cells = Array.isArray(raw) ? raw.length * ((raw[0] as unknown[] | undefined)?.length ?? 0) : 0;
  if (!cells || cells > CACHED_CELLS) return readTableUncached(arg, kind, raw);
  const key = `${arg}\u0000${kind}\u0000${JSON.stringify(raw)}`;
  const hit = tableCache.get(key);
  if (hit) return hit;
  const table = readTableUncached(arg, kind, raw);
  if (tableCache.size >= TABLE_CACHE_LIMIT) tableCache.delete(tableCache.keys().next().value!);
  tableCache.set(key, table);
  return table;
}

function readTableUncached(arg: string, kind: TableKind, raw: RawArg): Table {
  if (!Array.isArray(raw) || !raw.length || !Array.isArray(raw[0])) {
    throw new CalcError(arg, `expected a range of cells (a ${kind} table), got a single value`, "value");
  }
  const grid = raw as RawArg[][];
  if (grid.length > MAX_ROWS) throw new CalcError(arg, `has ${grid.length} rows; at most ${MAX_ROWS} are read`, "value");
  const roles = TABLE_ROLES[kind];
  const width = grid[0].length;
  const hasHeader = isHeaderRow(grid[0], roles);
  const unitsRow = hasHeader && isUnitsRow(grid[1]) ? grid[1] : undefined;
  // Which role each column plays.
  const assigned: { spec: RoleSpec; header?: string; unit: string; unitFrom: UnitSource }[] = [];
  if (hasHeader) {
    grid[0].forEach((cell, j) => {
      if (isBlank(cell)) return;
      const text = String(cell);
      const { name, unit } = splitHeader(text, roles);
      const spec = roles.find((r) => r.names.test(name));
      if (!spec) throw new CalcError(arg, `header "${text}" (column ${j + 1}) names no column of a ${kind} table; expected ${roles.map((r) => r.label).join(", ")}`, "value");
      if (assigned.some((a) => a.spec === spec)) throw new CalcError(arg, `two columns are headed ${spec.label}`, "value");
      const below = unitsRow && !isBlank(unitsRow[j]) ? String(unitsRow[j]).trim().replace(/^[([]\s*(.*?)\s*[)\]]$/, "$1") : "";
      if (unit && below && unit !== below) throw new CalcError(arg, `column "${text}" names the unit ${unit} and the units row under it ${below}: keep one`, "value");
      assigned[j] = { spec, header: below ? `${text} (${below})` : text, unit: unit || below, unitFrom: unit ? "header" : below ? "units row" : "base unit" };
    });
  } else {
    if (width > roles.length) throw new CalcError(arg, `has ${width} columns; a ${kind} table without a header has at most ${roles.length} (${roles.map((r) => r.label).join(", ")})`, "value");
    for (let j = 0; j < width; j++) assigned[j] = { spec: roles[j], unit: "", unitFrom: "base unit" };
  }
  for (const r of roles) {
    if (r.required && !assigned.some((a) => a && a.spec === r)) {
      throw new CalcError(arg, `has no ${r.label} column: ${hasHeader ? "name it in the header" : `columns without a header are ${roles.map((x) => x.label).join(", ")} in that order`}`, "value");
    }
  }
  // Data rows, blank trailing rows dropped.
  const headRows = (hasHeader ? 1 : 0) + (unitsRow ? 1 : 0);
  let body = grid.slice(headRows);
  let last = body.length - 1;
  while (last >= 0 && body[last].every(isBlank)) last--;
  body = body.slice(0, last + 1);
  body.forEach((row, i) => {
    if (row.every(isBlank)) throw new CalcError(arg, `row ${i + 1 + headRows} is blank inside the table`, "value");
  });
  const columns: TableColumn[] = [];
  assigned.forEach((a, j) => {
    if (!a) return;
    columns.push({ ...readColumn(arg, a.spec, a.header, a.unit, body.map((row) => row[j]), headRows + 1), index: j, unitFrom: a.unitFrom });
  });
  return { kind, hasHeader, headerRows: headRows, rows: body.length, columns };
}

function readColumn(arg: string, spec: RoleSpec, header: string | undefined, unit: string, cells: RawArg[], firstRow: number): Omit<TableColumn, "index" | "unitFrom"> {
  const label = header ? `"${header}"` : spec.label;
  const where = (i: number) => `row ${i + firstRow}, column ${label}`;
  const dimNoun = DIMENSIONS[spec.dim].noun;
  if (spec.dim === "ratio" && unit) throw new CalcError(arg, `column ${label} is a plain number and takes no unit`, "value");
  if (spec.dim === "efficiency" && unit && unit !== "%") throw new CalcError(arg, `column ${label}: efficiency is a fraction, or percent with a "%" header; "${unit}" is not understood`, "value");
  if (unit && spec.dim !== "efficiency" && spec.dim !== "ratio") toBase(arg, 1, spec.dim, unit); // throws on a wrong or unknown unit
  const values: (number | null)[] = [];
  const labels: (string | null)[] = [];
  cells.forEach((raw, i) => {
    labels.push(null);
    if (isBlank(raw)) {
      if (spec.required) throw new CalcError(arg, `${where(i)} is blank: every row needs ${dimNoun}`, "value");
      values.push(null);
      return;
    }
    const cell = raw as number | string | boolean | RawArg[][];
    if (typeof cell === "boolean" || Array.isArray(cell)) throw new CalcError(arg, `${where(i)}: expected ${dimNoun}; got ${String(cell)}`, "value");
    if (typeof cell === "number" || parseNumberText(cell) !== undefined) {
      const n = typeof cell === "number" ? cell : parseNumberText(cell)!;
      if (!Number.isFinite(n)) throw new CalcError(arg, `${where(i)}: expected a finite number`, "num");
      if (spec.dim === "efficiency") values.push(unit === "%" ? n / 100 : n);
      else values.push(unit ? toBase(arg, n, spec.dim, unit) : n);
      return;
    }
    try {
      values.push(parseQuantity(arg, cell, spec.dim).base);
    } catch (e) {
      if (!spec.labels) throw new CalcError(arg, `${where(i)}: ${e instanceof CalcError ? e.detail : String(e)}`, "value");
      values.push(null);
      labels[i] = cell.trim();
    }
  });
  if (spec.dim === "efficiency" && unit !== "%") {
    const big = values.find((v) => v !== null && v > 1);
    if (big !== undefined) {
      throw new CalcError(arg, `column ${label} holds ${big}, which looks like percent: head the column "Eff (%)" or give fractions (0.78)`, "num");
    }
  }
  return { role: spec.role, dim: spec.dim, header, unit: unit || DIMENSIONS[spec.dim].base, values, labels };
}

/** The column playing `role`, if any. */
export function column(table: Table, role: string): TableColumn | undefined {
  return table.columns.find((c) => c.role === role);
}

/** Writes a base-unit value back in a column's unit (for spilled tables). */
export function inColumnUnit(col: TableColumn, value: number): number {
  if (col.dim === "efficiency") return col.unit === "%" ? value * 100 : value;
  if (col.dim === "ratio" || col.unit === DIMENSIONS[col.dim].base) return value;
  return fromBase("curve", value, col.dim, col.unit);
}
