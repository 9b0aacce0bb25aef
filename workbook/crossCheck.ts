/**
 * The cross-check of a hand calculation, and its diagnosis (pure: a workbook model and a way to
 * read its current values). Nappe computes the quantity a hand formula computes, from the inputs
 * the hand formula reads, and says where the two part:
 *
 * - the hand formula's precedents are walked breadth-first to any depth (cycles reported), ranges
 *   included; constants and computed cells alike are candidates for Nappe's arguments, mapped by
 *   label, unit and symbol (crossCheckWords.ts), or pointed at a cell by hand;
 * - an input Nappe needs that the hand formula does not read (temperature, density, viscosity,
 *   surface pressure) comes from the workbook's one labelled cell for it (the hand formula's sheet
 *   first), said so; with none, or several that disagree, the verdict is "incomplete", never
 *   "agrees";
 * - each hand intermediate value is matched to Nappe's step (by label and symbol, in the order of
 *   the walk, nearest the result first); every step past 0.01 % is named, first one first, in the
 *   unit the hand sheet uses, with the usual causes found in formula text and labelled cells.
 *
 * One model, every view: the pane, the text and HTML audits, both audit sheets and the hand-off
 * notes show `diagnosisLines` of the same Diagnosis; a kept NAPPE.CROSSCHECK is diagnosed headless
 * from the arguments its NAPPE call passes.
 */
import { evaluate, type Evaluation, type RawArg } from "../functions/bind/evaluate";
import { STANDARD_ATMOSPHERE } from "../functions/calc/_lib/constants";
import { haalandFriction, swameeJainFriction } from "../functions/calc/friction";
import { CATALOG_BY_ID } from "../functions/catalog";
import type { FunctionSpec } from "../functions/catalog/types";
import { type Dimension, DIMENSIONS } from "../functions/units/dimensions";
import { fromBase, toBase } from "../functions/units/quantity";
import { addressOf, parseAddress, sheetPrefix, splitReference } from "./address";
import { labelScore, namesAnother, STEP_WORDS } from "./crossCheckWords";
import { formatNumber, formatQuantity, formatUnit } from "./format";
import { directPrecedents } from "./formula";
import { type CellValue, getCell, labelSource, type WorkbookModel } from "./model";
import { declaredUnit } from "./unitCheck";

/** The workbook and its current values (the host's, or a recalculation's). */
export interface CheckSource {
  wb: WorkbookModel;
  value(sheet: string, row: number, col: number): CellValue | CellValue[][];
}

/** A cell the hand calculation reads. */
interface HandCell {
  sheet: string;
  address: string;
  row: number;
  col: number;
  value: number;
  formula?: string;
  label: string;
  unit?: { unit: string; dim: Dimension };
  /** Precedent levels from the hand cell (1: read by it directly). */
  depth: number;
}

/** Where Nappe's argument came from. */
interface InputSource {
  name: string;
  /** "Inputs!B4", a literal ("20 degC"), or "(default)". */
  from: string;
  how: "label" | "by hand" | "kept check" | "workbook" | "assumed" | "default";
  /** What it was read as, for people ("60 °C"). */
  shown: string;
}

interface Departure {
  cell: string;
  symbol: string;
  name: string;
  /** Hand and Nappe values in the hand sheet's unit, with enough digits to recompute the difference. */
  hand: string;
  nappe: string;
  difference: string;
  ratio: number;
}

export interface Diagnosis {
  specId: string;
  handCell: string;
  handLabel: string;
  verdict: "agrees" | "differs" | "incomplete";
  /** Hand and Nappe values in the hand cell's unit, and the relative difference (hand − Nappe)/Nappe. */
  hand: number;
  nappe: number;
  unit: string;
  relativeDifference: number;
  tolerance: number;
  inputs: InputSource[];
  /** Inputs read from the workbook although the hand formula does not read them; assumptions. */
  notes: string[];
  /** Why the verdict is incomplete. */
  incomplete: string[];
  departures: Departure[];
  causes: string[];
  cycles: string[];
  /** The whole line, as every view opens it. */
  headline: string;
  evaluation: Evaluation;
  /** The diagnosis as every view shows it (diagnosisLines). */
  lines: string[];
}

/** A step that departs by more than this is named, whatever the verdict. */
const STEP_TOLERANCE = 1e-4;
/** More precedents than this and the walk stops (and says so). */
const MAX_CELLS = 20_000;
/** Ranges up to this many cells are walked cell by cell (a K table); larger ones are tables. */
const MAX_RANGE = 400;

const refText = (sheet: string, address: string, here: string) => `${sheet === here ? "" : sheetPrefix(sheet)}${address}`;

function labelOf(src: CheckSource, sheet: string, row: number, col: number): string {
  return labelSource(src.wb).labelsNear(sheet, row, col).find((l) => !/^[-+]?\d/.test(l)) ?? "";
}

function readCell(src: CheckSource, sheet: string, row: number, col: number, depth: number): HandCell | undefined {
  const model = getCell(src.wb, sheet, row, col);
  const v = src.value(sheet, row, col);
  const value = Array.isArray(v) ? v[0]?.[0] : v;
  if (typeof value !== "number") return undefined;
  const label = labelOf(src, sheet, row, col);
  const unit = (model?.numFmt && declaredUnit(model.numFmt)) || declaredUnit(label);
  return { sheet: model?.sheet ?? sheet, address: addressOf(row, col), row, col, value, formula: model?.formula, label, unit, depth };
}

/** Every cell the hand formula reads, breadth-first to any depth, nearest first; cycles named. */
function walk(src: CheckSource, start: HandCell): { cells: HandCell[]; cycles: string[]; truncated: boolean } {
  const key = (s: string, r: number, c: number) => `${s.toLowerCase()}!${r}:${c}`;
  const seen = new Map<string, HandCell>([[key(start.sheet, start.row, start.col), start]]);
  const edges = new Map<string, string[]>();
  const queue: HandCell[] = [start];
  const cells: HandCell[] = [];
  let truncated = false;
  for (let i = 0; i < queue.length; i++) {
    const c = queue[i];
    if (!c.formula) continue;
    let refs: ReturnType<typeof directPrecedents> = [];
    try {
      refs = directPrecedents(c.formula, { sheet: c.sheet, row: c.row, col: c.col });
    } catch {
      continue;
    }
    const out: string[] = [];
    for (const ref of refs) {
      const from = ref.from ?? { row: ref.row!, col: ref.col! };
      const to = ref.to ?? from;
      if ((to.row - from.row + 1) * (to.col - from.col + 1) > MAX_RANGE) continue;
      for (let r = from.row; r <= to.row; r++)
        for (let col = from.col; col <= to.col; col++) {
          const k = key(ref.sheet, r, col);
          out.push(k);
          if (seen.has(k)) continue;
          if (seen.size >= MAX_CELLS) {
            truncated = true;
            continue;
          }
          const p = readCell(src, ref.sheet, r, col, c.depth + 1);
          if (!p) continue;
          seen.set(k, p);
          cells.push(p);
          queue.push(p);
        }
    }
    edges.set(key(c.sheet, c.row, c.col), out);
  }
  // A cycle: a cell reached again from itself (iterative depth-first colouring of the walked graph).
  const cycles: string[] = [];
  const colour = new Map<string, 1 | 2>();
  for (const root of edges.keys()) {
    if (colour.has(root)) continue;
    const stack: { k: string; i: number }[] = [{ k: root, i: 0 }];
    colour.set(root, 1);
    while (stack.length) {
      const top = stack[stack.length - 1];
      const next = edges.get(top.k)?.[top.i++];
      if (next === undefined) {
        colour.set(top.k, 2);
        stack.pop();
      } else if (colour.get(next) === 1) {
        const from = stack.findIndex((s) => s.k === next);
        const names = stack.slice(from).map((s) => seen.get(s.k)).filter((x): x is HandCell => !!x).map((x) => refText(x.sheet, x.address, start.sheet));
        cycles.push(`${[...names, names[0]].join(" → ")}: a circular reference in the hand calculation`);
      } else if (!colour.has(next) && edges.has(next)) {
        colour.set(next, 1);
        stack.push({ k: next, i: 0 });
      }
    }
  }
  return { cells, cycles, truncated };
}

/** A candidate's base-unit value for a parameter of dimension `dim`: by its declared unit, else as a bare number. */
function inBase(c: HandCell, dim: Dimension): number {
  return c.unit && c.unit.dim === dim ? toBase(c.label, c.value, dim, c.unit.unit) : c.value;
}

/** A unit as a NAPPE argument writes it: "m³/h" → "m^3/h", "°C" → "degC". */
function typed(unit: string): string {
  return unit.replace(/²/g, "^2").replace(/³/g, "^3").replace(/°\s*C\b/g, "degC").replace(/°\s*F\b/g, "degF");
}

/** Gauge pressure by its label ("psig", "kPag", "barg", "gauge"). */
const GAUGE = /gauge|psig|kpag|barg/i;

/**
 * The argument a candidate cell passes, and as a formula writes it (`ref`): its number with the
 * unit its label declares; a percent as percent; a gauge pressure made absolute at the standard
 * atmosphere, said so.
 */
function rawOf(c: HandCell, dim: Dimension, ref = ""): { raw: RawArg; shown: string; written: string; note?: string } {
  if (dim === "pressure" && GAUGE.test(c.label)) {
    const unit = /psig/i.test(c.label) ? "psi" : /kpag/i.test(c.label) ? "kPa" : /barg/i.test(c.label) ? "bar" : c.unit?.unit ?? "Pa";
    const factor = toBase(c.label, 1, "pressure", unit);
    return {
      raw: c.value * factor + STANDARD_ATMOSPHERE,
      shown: `${formatQuantity(c.value, unit)} gauge + 101.325 kPa`,
      written: `${ref}*${factor}+${STANDARD_ATMOSPHERE}`,
      note: `${ref || refText(c.sheet, c.address, "")} is a gauge pressure ("${c.label}"): Nappe adds the standard atmosphere, 101.325 kPa (use the site's, NAPPE.ATMPRESSURE(elevation), where it matters)`,
    };
  }
  if (dim === "efficiency" && /%/.test(c.label) && c.value > 1) return { raw: `${c.value}%`, shown: `${formatNumber(c.value)} %`, written: `${ref}&"%"` };
  if (c.unit && c.unit.dim === dim) return { raw: `${c.value} ${typed(c.unit.unit)}`, shown: formatQuantity(c.value, formatUnit(c.unit.unit)), written: `${ref}&" ${typed(c.unit.unit)}"` };
  return { raw: c.value, shown: formatNumber(c.value), written: ref };
}

/** Parameters an input of the site or the water stands in for when the hand formula does not read it. */
const ENVIRONMENT = ["temperature", "density", "kinematic_viscosity", "surface_pressure"];
/** kg/m³ per lb/ft³ (NIST SP 811, appendix B: 1 lb/ft³ = 1.601 846 E+01 kg/m³). */
const KG_M3_PER_LB_FT3 = 16.01846337396;
/** Densities engineers type for water whatever its temperature (common practice: 1000 kg/m³, 62.4 lb/ft³, 998). */
const ROUND_DENSITIES = [1000, 62.4, 62.43, 998];

/** Numeric cells of the whole workbook labelled as `quantity` (the given sheet's first). */
function labelledCells(src: CheckSource, quantity: string, dim: Dimension | undefined, sheet: string): HandCell[] {
  const out: HandCell[] = [];
  for (const s of src.wb.sheets) {
    for (const cell of s.cells.values()) {
      if (cell.formula && /NAPPE\./i.test(cell.formula)) continue;
      const c = readCell(src, s.name, cell.row, cell.col, 0);
      if (!c || labelScore(c.label, quantity) < 2 || namesAnother(c.label, quantity)) continue;
      if (dim && c.unit && c.unit.dim !== dim) continue;
      out.push(c);
    }
  }
  return out.sort((a, b) => Number(b.sheet === sheet) - Number(a.sheet === sheet) || a.row - b.row || a.col - b.col);
}

/** The one value several candidate cells agree on (the given sheet's first), else undefined. */
function oneValue(cells: HandCell[], dim: Dimension | undefined, sheet: string): HandCell | undefined {
  const here = cells.filter((c) => c.sheet === sheet);
  const pool = here.length ? here : cells;
  if (!pool.length) return undefined;
  const base = (c: HandCell) => (dim ? inBase(c, dim) : c.value);
  return pool.every((c) => Math.abs(base(c) / base(pool[0]) - 1) < 1e-9) ? pool[0] : undefined;
}

function waterAt(specId: "WATER.DENSITY" | "WATER.KINVISC", temperature: RawArg): number {
  return evaluate(CATALOG_BY_ID.get(specId)!, [temperature]).base as number;
}

interface Mapped {
  raws: RawArg[];
  inputs: InputSource[];
  notes: string[];
  incomplete: string[];
}

/**
 * Fills what the hand formula does not give Nappe: the site and the water, from the workbook's
 * labelled cells (said so), or assumed (the verdict incomplete). `given[i]` undefined: not given.
 */
function fillEnvironment(spec: FunctionSpec, src: CheckSource, sheet: string, given: (RawArg | undefined)[], inputs: InputSource[]): Mapped {
  const raws: RawArg[] = given.map((g) => (g === undefined ? null : g));
  const notes: string[] = [];
  const incomplete: string[] = [];
  const index = (name: string) => spec.params.findIndex((p) => p.name === name);
  const temperatureCells = () => labelledCells(src, "temperature", "temperature", sheet);
  const describe = (cs: HandCell[]) => cs.map((c) => `${refText(c.sheet, c.address, sheet)} "${c.label}" = ${formatNumber(c.value)}`).join("; ");
  const tempRaw = (c: HandCell) => `${c.value} ${c.unit ? typed(c.unit.unit) : "degC"}`;
  const tempShown = (c: HandCell) => formatQuantity(c.value, c.unit ? formatUnit(c.unit.unit) : "°C");
  for (const name of ENVIRONMENT) {
    const i = index(name);
    if (i < 0 || given[i] !== undefined) continue;
    const p = spec.params[i];
    const dim = p.kind === "quantity" ? p.dim : undefined;
    const own = labelledCells(src, name, dim, sheet);
    const found = oneValue(own, dim, sheet);
    if (found && dim) {
      const { raw, shown } = rawOf(found, dim);
      raws[i] = raw;
      const at = refText(found.sheet, found.address, sheet);
      inputs.push({ name, from: at, how: "workbook", shown });
      notes.push(`Nappe read ${name.replace(/_/g, " ")} from ${at} ("${found.label}", ${shown}): the hand formula does not read it`);
      continue;
    }
    if ((name === "density" || name === "kinematic_viscosity") && !own.length) {
      const temps = temperatureCells();
      const t = oneValue(temps, "temperature", sheet);
      if (t) {
        raws[i] = waterAt(name === "density" ? "WATER.DENSITY" : "WATER.KINVISC", tempRaw(t));
        const at = refText(t.sheet, t.address, sheet);
        inputs.push({ name, from: `water at ${at}`, how: "workbook", shown: `water at ${tempShown(t)}` });
        notes.push(`Nappe took the ${name.replace(/_/g, " ")} of water at ${tempShown(t)} from ${at} ("${t.label}"): the hand formula does not read it`);
        continue;
      }
      const several = temps.length ? ` (the workbook's temperature cells disagree: ${describe(temps)})` : " (the workbook has no labelled temperature or " + name.replace(/_/g, " ") + ")";
      inputs.push({ name, from: "(default)", how: "default", shown: "water at 20 °C" });
      incomplete.push(`Nappe assumed water at 20 °C for the ${name.replace(/_/g, " ")}${several}: point ${name} at a cell`);
      continue;
    }
    if (own.length) {
      inputs.push({ name, from: "(none)", how: "assumed", shown: "" });
      incomplete.push(`several cells give ${name.replace(/_/g, " ")} and they disagree: ${describe(own)}: point ${name} at one`);
      if (name === "temperature") raws[i] = "20 degC";
      continue;
    }
    if (name === "temperature") {
      raws[i] = "20 degC";
      inputs.push({ name, from: "20 degC", how: "assumed", shown: "20 °C" });
      incomplete.push("Nappe assumed 20 °C for the temperature: no cell in the workbook is labelled as one; point temperature at a cell or type it");
    } else if (name === "surface_pressure") {
      raws[i] = STANDARD_ATMOSPHERE;
      inputs.push({ name, from: `${STANDARD_ATMOSPHERE} Pa`, how: "assumed", shown: "101.325 kPa" });
      incomplete.push("Nappe assumed the standard atmosphere, 101.325 kPa, for the surface pressure: no cell in the workbook is labelled as one");
    }
  }
  // A round density (1000, 62.4) typed for water whose temperature the workbook gives: Nappe uses water at that temperature.
  const d = index("density");
  if (d >= 0) {
    const src0 = inputs.find((x) => x.name === "density" && (x.how === "label" || x.how === "by hand"));
    const t = src0 ? oneValue(temperatureCells(), "temperature", sheet) : undefined;
    const typed = typeof given[d] === "string" ? parseFloat(given[d] as string) : (given[d] as number);
    if (src0 && t && ROUND_DENSITIES.includes(typed)) {
      const water = waterAt("WATER.DENSITY", tempRaw(t));
      raws[d] = water;
      src0.shown = `water at ${tempShown(t)} (not the ${formatNumber(typed)} typed)`;
      notes.push(`Nappe took the density of water at ${tempShown(t)} from ${refText(t.sheet, t.address, sheet)}, ${formatQuantity(water, "kg/m³")}, not the round ${formatNumber(typed)} in ${src0.from}`);
    }
  }
  return { raws, inputs, notes, incomplete };
}

/** Nappe's steps, with the arguments a hand sheet also computes (Q in m³/s, D in m, L in m) first. */
function comparable(spec: FunctionSpec, ev: Evaluation): { symbol: string; name: string; value: number; dim: Dimension; aliases: readonly string[] }[] {
  const args = [
    ["flow", "Q", "flow", ["flow", "flow rate", "discharge"]],
    ["diameter", "D", "inside diameter", ["diameter", "bore"]],
    ["length", "L", "pipe length", ["length"]],
  ] as const;
  const out: { symbol: string; name: string; value: number; dim: Dimension; aliases: readonly string[] }[] = [];
  for (const [param, symbol, name, aliases] of args) {
    const r = ev.readings.find((x) => x.name === param);
    const p = spec.params.find((x) => x.name === param);
    if (r && typeof r.value === "number" && p?.kind === "quantity") out.push({ symbol, name, value: r.value, dim: p.dim, aliases: [...aliases] });
  }
  for (const s of ev.steps) out.push({ symbol: s.symbol, name: s.name, value: s.value, dim: s.dim as Dimension, aliases: STEP_WORDS[s.symbol] ?? [s.name.split(/[,:(]/)[0].trim()] });
  return out;
}

const escapeRe = (s: string) => s.replace(/[.*+?^${}()|[\]\\/]/g, "\\$&");

/** How well a hand cell's label names a step: the longest alias it contains, else its symbol as a token. */
function stepScore(label: string, step: { symbol: string; aliases: readonly string[] }): number {
  const name = label.replace(/\([^()]*\)\s*$/, " ");
  const words = step.aliases.filter((a) => new RegExp(`(^|[^A-Za-z])${escapeRe(a)}([^A-Za-z]|$)`, "i").test(name));
  if (words.length) return 10 + Math.max(...words.map((w) => w.length));
  return new RegExp(`(^|[^A-Za-z0-9_/ΣεηνρΔ])${escapeRe(step.symbol)}([^A-Za-z0-9_/ΣεηνρΔ²]|$)`).test(name) ? 5 : 0;
}

/** Digits enough for two numbers differing by `relative` to show the difference. */
function digitsFor(relative: number): number {
  if (!(Math.abs(relative) > 1e-9)) return 6;
  return Math.min(12, Math.max(4, Math.ceil(-Math.log10(Math.abs(relative))) + 3));
}

/** A number with `digits` significant figures and its unit, as people read it. */
function withUnit(x: number, unit: string, digits: number): string {
  const u = formatUnit(unit);
  return u ? `${formatNumber(x, digits)} ${u}` : formatNumber(x, digits);
}

function percentText(relative: number): string {
  const p = relative * 100;
  if (Math.abs(relative) < 1e-9) return "0 % (equal to 9 figures)";
  const text = Math.abs(p) >= 1e4 ? `×${formatNumber(relative + 1, 4)}` : `${p > 0 ? "+" : ""}${formatNumber(p, 3)} %`;
  return text;
}

/** US customary for a dimension, when the hand sheet works in US units. */
const US_UNIT: Partial<Record<Dimension, string>> = { length: "ft", flow: "ft^3/s", velocity: "ft/s", pressure: "psi", power: "hp", density: "lb/ft^3", kinematicViscosity: "ft^2/s" };

/** The unit a value of `dim` is shown in: the hand cell's own, else the hand sheet's system. */
function unitFor(dim: Dimension, cell: HandCell | undefined, us: boolean): string {
  if (cell?.unit && cell.unit.dim === dim) return cell.unit.unit;
  return (us && US_UNIT[dim]) || DIMENSIONS[dim].base;
}

function inUnit(value: number, dim: Dimension, unit: string): number {
  return unit === DIMENSIONS[dim].base ? value : fromBase("value", value, dim, unit);
}

const GPM_PER_CFS = 448.8311688311688; // NIST SP 811: 1 ft³/s = 448.831 US gal/min
const IMPERIAL_PER_US = 4.54609 / 3.785411784; // NIST SP 811 gallons

/** The usual causes, from the hand formulas' text, the labelled constants they read, and the departures' ratios. */
function causesOf(spec: FunctionSpec, cells: readonly HandCell[], hand: HandCell, departures: readonly Departure[], ev: Evaluation, sheet: string, resultRatio: number, us: boolean): string[] {
  const causes: string[] = [];
  const chain = [hand, ...cells];
  const text = chain.map((c) => c.formula ?? "").join(" ");
  const near = (r: number, k: number, tol = 0.01) => Math.abs(r / k - 1) < tol;
  const ratios = [...departures.map((d) => d.ratio), resultRatio];
  const departed = (symbol: string) => departures.find((d) => d.symbol === symbol);
  const at = (c: HandCell) => `${refText(c.sheet, c.address, sheet)} ("${c.label}")`;
  const constantCell = (quantity: string, values: number[]) => cells.find((c) => !c.formula && labelScore(c.label, quantity) > 0 && values.some((v) => Math.abs(c.value / v - 1) < 1e-6));
  const textHas = (re: RegExp) => re.test(text);
  if (!departures.length && !(Math.abs(resultRatio - 1) > STEP_TOLERANCE)) return causes;
  const g981 = constantCell("gravity", [9.81]);
  if (g981 || textHas(/(^|[^\d.])9\.81(?!\d)/)) causes.push(`g = 9.81 m/s²${g981 ? ` in ${at(g981)}` : " in the formula"} instead of standard gravity 9.80665 m/s² (0.034 %)`);
  const g322 = constantCell("gravity", [32.2, 32.17]);
  if (g322 || textHas(/(^|[^\d.])32\.2(?!\d)/)) causes.push(`g = ${g322 ? formatNumber(g322.value) : "32.2"} ft/s²${g322 ? ` in ${at(g322)}` : " in the formula"} instead of standard gravity 32.174 ft/s²`);
  const density = ev.readings.find((r) => r.name === "density");
  const rho = density && typeof density.value === "number" ? density.value : undefined;
  const roundCell = constantCell("density", ROUND_DENSITIES);
  const roundText = textHas(/(^|[^\d.])1000\s*\*\s*(9\.8|32\.\d)|(9\.8\d*|32\.\d+)\s*\*\s*1000(?![\d.])|(^|[^\d.])62\.4\d?(?!\d)/);
  if ((roundCell || roundText) && rho !== undefined && Math.abs(rho / (roundCell && roundCell.value < 100 ? roundCell.value * KG_M3_PER_LB_FT3 : 1000) - 1) > 1e-4) {
    causes.push(`density ${roundCell ? `${formatNumber(roundCell.value)} in ${at(roundCell)}` : "1000 kg/m³ (62.4 lb/ft³) in the formula"} used instead of water at its temperature, ${us ? formatQuantity(rho / KG_M3_PER_LB_FT3, "lb/ft³") : formatQuantity(rho, "kg/m³")}`);
  }
  const f = departed("f");
  const rr = ev.steps.find((s) => s.symbol === "ε/D");
  const re = ev.steps.find((s) => s.symbol === "Re");
  if (f && rr && re) {
    const handF = (d: Departure) => d.ratio * ev.steps.find((s) => s.symbol === "f")!.value;
    const hf = handF(f);
    if (near(hf, swameeJainFriction(re.value, rr.value), 1e-4)) causes.push("an explicit friction formula (Swamee–Jain) instead of Colebrook");
    else if (near(hf, haalandFriction(re.value, rr.value), 1e-4)) causes.push("an explicit friction formula (Haaland) instead of Colebrook");
    else if (rr.value > 0 && near(hf * (2 * Math.log10(rr.value / 3.7)) ** 2, 1)) causes.push("a fully turbulent friction factor (independent of Re) where the flow is not fully rough");
    else if (textHas(/5\.74/) && /5\.74/.test(chain.find((c) => refText(c.sheet, c.address, sheet) === f.cell)?.formula ?? "")) causes.push("an explicit friction formula (Swamee–Jain) instead of Colebrook");
  }
  if (ratios.some((r) => [GPM_PER_CFS, 1 / GPM_PER_CFS, GPM_PER_CFS ** 2, 1 / GPM_PER_CFS ** 2].some((k) => near(r, k)))) causes.push("a gpm / ft³/s slip (a factor of 448.8): a flow in gpm used as ft³/s, or the reverse");
  const q = departed("Q") ?? departed("V");
  if (q && (near(q.ratio, IMPERIAL_PER_US, 1e-3) || near(q.ratio, 1 / IMPERIAL_PER_US, 1e-3))) causes.push("the imperial gallon (4.546 L) where the flow is in US gallons (3.785 L): a factor of 1.201");
  const d = departed("D");
  if (d && near(d.ratio, 1 / 25.4, 1e-3)) causes.push("inches divided by 1000 (read as millimetres) instead of multiplied by 0.0254 m/in: a factor of 25.4");
  if (d && near(d.ratio, 25.4, 1e-3)) causes.push("millimetres read as inches: a factor of 25.4");
  const vh = departed("V²/2g");
  const v = departed("V");
  if ((vh && near(vh.ratio, 2, 1e-3) && !(v && !near(v.ratio, 1, 1e-3))) || (spec.id === "HEADLOSS.MINOR" && !vh && near(resultRatio, 2, 1e-3))) causes.push("V²/g written for the velocity head V²/2g: a factor of 2");
  if (spec.params.some((p) => p.name === "surface_pressure") && chain.some((c) => GAUGE.test(c.label))) causes.push("gauge pressure used where absolute is expected (add the atmospheric pressure, NAPPE.ATMPRESSURE)");
  const pv = ev.steps.find((s) => s.symbol === "p_v/ρg");
  if (spec.id === "NPSHA" && pv && typeof ev.base === "number") {
    const gap = (resultRatio - 1) * ev.base;
    if (Math.abs(gap / pv.value - 1) < 0.02 && !departed("p_v/ρg")) causes.push(`the vapour pressure left out: the hand value is above Nappe's by p_v/ρg = ${formatQuantity(inUnit(pv.value, "length", us ? "ft" : "m"), us ? "ft" : "m")}`);
  }
  return [...new Set(causes)];
}

/**
 * Diagnoses the hand value at `at` against Nappe's `spec`, given the arguments (`given[i]`
 * undefined where the hand side gives none) and where each came from.
 */
function diagnose(src: CheckSource, at: { sheet: string; address: string }, spec: FunctionSpec, given: (RawArg | undefined)[], inputs: InputSource[], tolerance: number, walked?: { cells: HandCell[]; cycles: string[]; truncated: boolean }): Diagnosis {
  const { row, col } = parseAddress(at.address);
  const hand = readCell(src, at.sheet, row, col, 0);
  if (!hand) throw new Error(`${at.sheet}!${at.address} holds no number to check`);
  const { cells, cycles, truncated } = walked ?? walk(src, hand);
  const filled = fillEnvironment(spec, src, at.sheet, given, inputs);
  const unitIndex = spec.params.findIndex((p) => p.name === "unit");
  if (unitIndex >= 0) filled.raws[unitIndex] = null;
  const ev = evaluate(spec, filled.raws);
  if (typeof ev.base !== "number") throw new Error(`NAPPE.${spec.id} spills a table: cross-check one of its values instead`);
  const dim = ev.dim;
  const us = [hand, ...cells].some((c) => c.unit && /ft|in\b|gpm|gal|psi|lb|hp|°F|degF/.test(c.unit.unit));
  const unit = unitFor(dim, hand, us);
  const handBase = inBase(hand, dim);
  const relativeDifference = (handBase - ev.base) / ev.base;
  const departures: Departure[] = [];
  // Hand intermediate cells matched to Nappe's steps: by label (nearest the result first), then by a value within 10 %.
  const steps = comparable(spec, ev);
  const used = new Set<(typeof steps)[number]>();
  const matched: { cell: HandCell; step: (typeof steps)[number] }[] = [];
  const candidates = cells.filter((c) => c.formula);
  for (const c of candidates) {
    const ranked = steps.map((s) => ({ s, n: stepScore(c.label, s) })).filter((x) => x.n > 0).sort((a, b) => b.n - a.n);
    if (ranked.length) {
      const free = ranked.find((x) => !used.has(x.s) && (!c.unit || c.unit.dim === x.s.dim));
      if (free && free.n === ranked[0].n) {
        used.add(free.s);
        matched.push({ cell: c, step: free.s });
      }
      continue;
    }
    const byValue = steps.find((s) => !used.has(s) && (!c.unit || c.unit.dim === s.dim) && Math.abs(inBase(c, s.dim) / s.value - 1) < 0.1);
    if (byValue) {
      used.add(byValue);
      matched.push({ cell: c, step: byValue });
    }
  }
  matched.sort((a, b) => steps.indexOf(a.step) - steps.indexOf(b.step));
  for (const m of matched) {
    const h = inBase(m.cell, m.step.dim);
    const ratio = h / m.step.value;
    if (!(Math.abs(ratio - 1) > STEP_TOLERANCE)) continue;
    const u = unitFor(m.step.dim, m.cell, us);
    const digits = digitsFor(ratio - 1);
    const shownHand = m.cell.unit && m.cell.unit.dim === m.step.dim ? m.cell.value : inUnit(h, m.step.dim, u);
    departures.push({
      cell: refText(m.cell.sheet, m.cell.address, at.sheet),
      symbol: m.step.symbol,
      name: m.step.name,
      hand: withUnit(shownHand, u, digits),
      nappe: withUnit(inUnit(m.step.value, m.step.dim, u), u, digits),
      difference: percentText(ratio - 1),
      ratio,
    });
  }
  const resultRatio = handBase / ev.base;
  const causes = causesOf(spec, cells, hand, departures, ev, at.sheet, resultRatio, us);
  const incomplete = [...filled.incomplete, ...(truncated ? [`the hand calculation reads more than ${MAX_CELLS} cells: the walk stopped there`] : [])];
  const verdict = incomplete.length ? "incomplete" : Math.abs(relativeDifference) <= tolerance ? "agrees" : "differs";
  const handShown = inUnit(handBase, dim, unit);
  const nappeShown = inUnit(ev.base, dim, unit);
  const digits = digitsFor(relativeDifference);
  const numbers = `hand ${withUnit(handShown, unit, digits)}, Nappe ${withUnit(nappeShown, unit, digits)}, difference ${percentText(relativeDifference)} (tolerance ${formatNumber(tolerance * 100, 3)} %)`;
  const word = verdict === "agrees" ? "Agrees" : verdict === "differs" ? "Differs" : `Incomplete: ${incomplete[0].split(":")[0]}`;
  return {
    specId: spec.id,
    handCell: refText(hand.sheet, hand.address, at.sheet),
    handLabel: hand.label,
    verdict,
    hand: handShown,
    nappe: nappeShown,
    unit,
    relativeDifference,
    tolerance,
    inputs: filled.inputs,
    notes: filled.notes,
    incomplete,
    departures,
    causes,
    cycles,
    headline: `${word}: ${numbers}`,
    evaluation: ev,
    lines: [],
  };
}

/** The diagnosis as lines of text, the same in every view: the verdict, the departing steps, the causes, what Nappe read or assumed. */
function diagnosisLines(d: Diagnosis): string[] {
  const lines = [`Cross-check of ${d.handCell}${d.handLabel ? ` ("${d.handLabel}")` : ""} as NAPPE.${d.specId}: ${d.headline}`];
  if (d.verdict === "incomplete") for (const i of d.incomplete) lines.push(`Incomplete: ${i}`);
  if (d.departures.length) {
    lines.push(`First step that departs: ${departureText(d.departures[0])}`);
    for (const x of d.departures.slice(1)) lines.push(`Also departs: ${departureText(x)}`);
  } else if (Math.abs(d.relativeDifference) > STEP_TOLERANCE) lines.push("No hand step matched to Nappe's departs: the difference arises in the last formula");
  for (const c of d.causes) lines.push(`Likely cause: ${c}`);
  if ((d.departures.length || Math.abs(d.relativeDifference) > STEP_TOLERANCE) && !d.causes.length && d.verdict !== "incomplete") lines.push("Likely cause: none of the usual slips matched; compare the first departing step's formula with Nappe's");
  for (const n of d.notes) lines.push(`Read: ${n}`);
  for (const c of d.cycles) lines.push(`Cycle: ${c}`);
  return lines;
}

function departureText(x: Departure): string {
  return `${x.cell} ${x.symbol} (${x.name}) ${x.hand} vs Nappe ${x.nappe}, ${x.difference}`;
}

/** The number a formula text holds, with its unit when the text is a quantity ("20 degC"), for the check the pane writes. */
function literalArg(text: string): RawArg {
  const n = Number(text);
  return text.trim() !== "" && Number.isFinite(n) ? n : text;
}

/**
 * The pane's cross-check: the hand value at sheet!address as the quantity `specId` computes,
 * its inputs mapped from the hand formula's precedents by label, unit and symbol, or as the
 * user pointed them (`mapping`: argument → "B7", "Inputs!B7" or a literal such as "20 degC").
 */
export function crossCheckHand(src: CheckSource, sheet: string, address: string, specId: string, options: { tolerance?: number; mapping?: Record<string, string> } = {}): Diagnosis & { keepFormula: string } {
  const spec = CATALOG_BY_ID.get(specId);
  if (!spec) throw new Error(`no function NAPPE.${specId}`);
  const { row, col } = parseAddress(address);
  const hand = readCell(src, sheet, row, col, 0);
  if (!hand) throw new Error(`${sheet}!${address} holds no number to check`);
  const walked = walk(src, hand);
  const constants = walked.cells.filter((c) => !c.formula);
  const computed = walked.cells.filter((c) => c.formula);
  const given: (RawArg | undefined)[] = [];
  const inputs: InputSource[] = [];
  const written: string[] = [];
  const taken = new Set<HandCell>();
  const missing: string[] = [];
  const notes: string[] = [];
  for (const p of spec.params) {
    const chosen = options.mapping?.[p.name]?.trim();
    if (p.kind !== "quantity") {
      given.push(undefined);
      written.push("");
      continue;
    }
    let cell: HandCell | undefined;
    if (chosen) {
      const target = /^(?:'[^']+'|[^!\s"]+)!\$?[A-Z]{1,3}\$?\d+$|^\$?[A-Z]{1,3}\$?\d+$/i.test(chosen) ? splitReference(chosen.replace(/\$/g, ""), sheet) : undefined;
      if (target) {
        const t = parseAddress(target.address);
        cell = walked.cells.find((c) => c.sheet.toLowerCase() === target.sheet.toLowerCase() && c.row === t.row && c.col === t.col) ?? readCell(src, target.sheet, t.row, t.col, 0);
        if (!cell) throw new Error(`${p.name}: ${chosen} holds no number`);
      } else {
        const raw = literalArg(chosen);
        given.push(raw);
        inputs.push({ name: p.name, from: chosen, how: "by hand", shown: chosen });
        written.push(typeof raw === "number" ? String(raw) : `"${chosen.replace(/"/g, '""')}"`);
        continue;
      }
    } else {
      const fits = (c: HandCell) => !taken.has(c) && (!c.unit || c.unit.dim === p.dim) && labelScore(c.label, p.name) > 0 && !namesAnother(c.label, p.name);
      const best = (pool: HandCell[]) => pool.filter(fits).sort((a, b) => labelScore(b.label, p.name) - labelScore(a.label, p.name) || Number(!!b.unit) - Number(!!a.unit))[0];
      // The user's own inputs first: a computed cell only where no constant is labelled for it.
      cell = best(constants) ?? best(computed);
    }
    if (!cell) {
      given.push(undefined);
      written.push("");
      if (!p.optional && !ENVIRONMENT.includes(p.name)) missing.push(p.name);
      continue;
    }
    taken.add(cell);
    const ref = refText(cell.sheet, cell.address, sheet);
    const arg = rawOf(cell, p.dim, ref);
    given.push(arg.raw);
    inputs.push({ name: p.name, from: ref, how: chosen ? "by hand" : "label", shown: arg.shown });
    if (arg.note) notes.push(arg.note);
    written.push(arg.written);
  }
  if (missing.length) {
    const names = walked.cells.map((c) => `${refText(c.sheet, c.address, sheet)}${c.label ? ` "${c.label}"` : ""}`);
    throw new Error(`${missing.join(", ")}: no cell the hand formula reads is labelled as ${missing.length > 1 ? "these" : "one"}; point ${missing.length > 1 ? "them" : "it"} at a cell (the formula reads ${names.slice(0, 12).join(", ")}${names.length > 12 ? ", …" : ""})`);
  }
  const tolerance = options.tolerance ?? 0.005;
  const d = diagnose(src, { sheet, address }, spec, given, inputs, tolerance, walked);
  d.notes.unshift(...notes);
  // The kept check: Nappe's call in the hand cell's unit, the inputs as mapped (the workbook's ones too).
  const unitIndex = spec.params.findIndex((p) => p.name === "unit");
  for (const x of d.inputs) {
    const i = spec.params.findIndex((p) => p.name === x.name);
    if (i < 0 || written[i]) continue;
    if (x.how === "workbook" && x.from.startsWith("water at ")) written[i] = `NAPPE.${x.name === "density" ? "WATER.DENSITY" : "WATER.KINVISC"}(${tempFormula(src, x.from.slice(9), sheet)})`;
    else if (x.how === "workbook") written[i] = refUnit(src, x.from, sheet);
    else if (x.how === "assumed" && x.from !== "(none)") written[i] = `"${x.from}"`;
  }
  for (const x of d.inputs) {
    const i = spec.params.findIndex((p) => p.name === x.name);
    if (x.name === "density" && x.shown.startsWith("water at ") && x.how !== "workbook" && i >= 0) {
      const t = oneValue(labelledCells(src, "temperature", "temperature", sheet), "temperature", sheet);
      if (t) written[i] = `NAPPE.WATER.DENSITY(${tempFormula(src, refText(t.sheet, t.address, sheet), sheet)})`;
    }
  }
  if (unitIndex >= 0 && d.unit !== DIMENSIONS[d.evaluation.dim].base) written[unitIndex] = `"${d.unit}"`;
  while (written.length && written[written.length - 1] === "") written.pop();
  const keepFormula = `NAPPE.CROSSCHECK(${refText(hand.sheet, hand.address, sheet)}, NAPPE.${specId}(${written.join(", ")}), ${tolerance})`;
  d.lines = diagnosisLines(d);
  return { ...d, keepFormula };
}

function refUnit(src: CheckSource, ref: string, sheet: string): string {
  const t = splitReference(ref, sheet);
  const { row, col } = parseAddress(t.address);
  const c = readCell(src, t.sheet, row, col, 0);
  return c?.unit ? `${ref}&" ${typed(c.unit.unit)}"` : ref;
}

function tempFormula(src: CheckSource, ref: string, sheet: string): string {
  const r = refUnit(src, ref, sheet);
  return r === ref ? `${ref}&" degC"` : r;
}

/**
 * The diagnosis of a kept check, `NAPPE.CROSSCHECK(hand, NAPPE.X(…), tolerance)`: the hand cell
 * its first argument names, Nappe's call as the check writes it (an argument it leaves to a
 * water-at-20 °C default comes from the workbook's temperature, or the verdict is incomplete).
 */
export function diagnoseKeptCheck(src: CheckSource, sheet: string, handRef: string, inner: Evaluation, specId: string, tolerance: number): Diagnosis {
  const spec = CATALOG_BY_ID.get(specId);
  if (!spec) throw new Error(`no function NAPPE.${specId}`);
  const target = splitReference(handRef.replace(/\$/g, ""), sheet);
  const given: (RawArg | undefined)[] = spec.params.map((p) => {
    const r = inner.readings.find((x) => x.name === p.name);
    if (!r || r.how === "default") return undefined;
    return r.how === "table" || r.how === "word" || r.how === "unit name" ? r.raw : typeof r.value === "number" ? r.value : r.raw;
  });
  const inputs: InputSource[] = inner.readings.filter((r) => r.how !== "default").map((r) => ({ name: r.name, from: "(the check's call)", how: "kept check" as const, shown: typeof r.raw === "string" || typeof r.raw === "number" ? String(r.raw) : "" }));
  const unitIndex = spec.params.findIndex((p) => p.name === "unit");
  if (unitIndex >= 0) given[unitIndex] = undefined;
  const d = diagnose(src, target, spec, given, inputs, tolerance);
  const defaulted = inner.readings.filter((r) => r.how === "default" && ENVIRONMENT.includes(r.name) && d.inputs.some((x) => x.name === r.name && x.how === "workbook"));
  if (defaulted.length) d.notes.unshift(`The check's NAPPE.${specId} leaves ${defaulted.map((r) => r.name).join(" and ")} to the default (water at 20 °C), so the value it shows compares with 20 °C water; the diagnosis uses the workbook's`);
  d.lines = diagnosisLines(d);
  return d;
}
