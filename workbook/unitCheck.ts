/**
 * Unit check of NAPPE arguments read from cells: a bare number is read in the base unit, so a
 * cell whose label (left or above) or number format names another unit is probably misread.
 * Pure: it reads the workbook through the small LabelSource interface, so the side pane can
 * use it with its own host adapter.
 */
import type { FunctionSpec } from "../functions/catalog/types";
import type { Evaluation } from "../functions/bind/evaluate";
import { type Dimension, DIMENSIONS, hasUnit } from "../functions/units/dimensions";
import { dimensionOfUnit, toBase } from "../functions/units/quantity";
import type { Table } from "../functions/tables/table";
import { addressOf, parseAddress, sheetPrefix, splitReference } from "./address";
import { formatNumber } from "./format";

export interface LabelSource {
  /** Text of the nearest label cells: to the left on the same row, then above. */
  labelsNear(sheet: string, row: number, col: number): string[];
  /** The cell's number format, if any. */
  numberFormat(sheet: string, row: number, col: number): string | undefined;
  /** The cell's formula (without "="), where the source knows it: lets the check follow plain references. */
  formula?(sheet: string, row: number, col: number): string | undefined;
}

const PLAIN_REFERENCE = /^\s*((?:'(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_.]*)!)?\$?([A-Za-z]{1,3})\$?(\d+)\s*$/;

/**
 * Where a cell's number comes from: the cell itself, or, while its formula is a plain reference
 * (=Inputs!B14), the cell it copies. Returns each cell on the way, the cell itself first.
 */
export function referenceChain(labels: Pick<LabelSource, "formula">, sheet: string, row: number, col: number): { sheet: string; row: number; col: number }[] {
  const chain = [{ sheet, row, col }];
  for (let i = 0; i < 10; i++) {
    const here = chain[chain.length - 1];
    const m = PLAIN_REFERENCE.exec(labels.formula?.(here.sheet, here.row, here.col) ?? "");
    if (!m) break;
    const target = splitReference(`${m[1] ?? ""}${m[2]}${m[3]}`, here.sheet);
    const { row: r, col: c } = parseAddress(target.address);
    chain.push({ sheet: target.sheet, row: r, col: c });
  }
  return chain;
}

interface Declaration {
  text: string;
  declared: { unit: string; dim: Dimension };
  /** The cell the label belongs to, as the message names it ("B14" or "Inputs!B14"). */
  cell: string;
  /** That cell's place, and whether a label cell near it (not its number format) declared the unit. */
  at: { sheet: string; address: string };
  byLabel: boolean;
}

/** The first label or number format on the way that declares a unit, with the cell it belongs to. */
function declaredOnChain(labels: LabelSource, sheet: string, row: number, col: number, here = sheet): Declaration | undefined {
  for (const c of referenceChain(labels, sheet, row, col)) {
    const format = labels.numberFormat(c.sheet, c.row, c.col);
    for (const text of [format, ...labels.labelsNear(c.sheet, c.row, c.col)]) {
      const declared = text ? declaredUnit(text) : undefined;
      const address = addressOf(c.row, c.col);
      if (text && declared) return { text, declared, cell: `${c.sheet === here ? "" : sheetPrefix(c.sheet)}${address}`, at: { sheet: c.sheet, address }, byLabel: text !== format };
    }
  }
  return undefined;
}

/**
 * The label text with its unit replaced: "Suction pipe length (ft)" → "Suction pipe length (m)".
 * The unit in brackets or quotes is replaced where it stands; a label that is only a unit word
 * becomes the new unit.
 */
export function relabelled(text: string, unit: string, to: string): string {
  const escaped = unit.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  const inBrackets = new RegExp(`([([]\\s*)${escaped}(\\s*[)\\]])`);
  if (inBrackets.test(text)) return text.replace(inBrackets, `$1${to}$2`);
  const quoted = new RegExp(`"\\s*${escaped}\\s*"`);
  if (quoted.test(text)) return text.replace(quoted, `"${to}"`);
  return text.trim() === unit ? to : text;
}

/**
 * Table columns whose header names one unit while a cell copies an input labelled in another
 * ("Length (m)" over =Inputs!B14, labelled "Suction pipe length (ft)"): the same mistake as a
 * mislabelled bare number.
 */
function tableFindings(spec: FunctionSpec, evaluation: Evaluation, refs: readonly (string | undefined)[], here: string, labels: LabelSource): UnitFinding[] {
  const findings: UnitFinding[] = [];
  spec.params.forEach((p, i) => {
    const ref = refs[i];
    const reading = evaluation.readings.find((r) => r.name === p.name);
    if (!ref || !ref.includes(":") || p.kind !== "table" || reading?.how !== "table") return;
    const table = reading.value as Table;
    const { sheet, address } = splitReference(ref, here);
    const [from] = address.split(":");
    const origin = parseAddress(from);
    table.columns.forEach((column) => {
      if (!column.header || !column.unit) return;
      for (let k = 0; k < table.rows; k++) {
        const row = origin.row + table.headerRows + k;
        const col = origin.col + column.index;
        const chain = referenceChain(labels, sheet, row, col);
        if (chain.length < 2) continue;
        const found = declaredOnChain(labels, chain[1].sheet, chain[1].row, chain[1].col, here);
        if (!found || found.declared.dim !== column.dim) continue;
        const same = Math.abs(toBase(p.name, 1, column.dim, found.declared.unit) / toBase(p.name, 1, column.dim, column.unit) - 1) < 1e-9;
        if (same) continue;
        const cell = `${sheet === here ? "" : sheetPrefix(sheet)}${addressOf(row, col)}`;
        findings.push({
          arg: p.name,
          ref: cell,
          message: `${cell}, under "${column.header}", copies ${found.cell}, labelled "${found.text}": the table reads its number in ${column.unit}, not ${found.declared.unit}. Convert it in the table (or change the header), or correct the label.`,
        });
      }
    });
  });
  return findings;
}

export interface UnitFinding {
  /** The argument's name. */
  arg: string;
  /** "Sheet!B7" or "B7". */
  ref: string;
  message: string;
  /** The formula text that fixes it: the reference joined with the unit, such as B7&" ft". */
  fix?: string;
  /** The unit the label declares, when joining it would fix the reading. */
  unit?: string;
  /**
   * The other way to fix it, when a label cell (not a number format) declared the unit: the
   * input cell the label belongs to, the label's text, and the text saying the unit the number
   * is read in ("Suction pipe length (ft)" → "Suction pipe length (m)").
   */
  label?: { sheet: string; address: string; text: string; corrected: string };
}

const ALL_DIMS = Object.keys(DIMENSIONS) as Dimension[];

/** Unit names a label or number format declares: "(ft)", "[gpm]", a quoted "gpm" in a format, or a bare unit word. */
function unitsDeclared(text: string): string[] {
  const found: string[] = [];
  for (const m of text.matchAll(/[([]\s*([^()[\]]+?)\s*[)\]]/g)) found.push(m[1]);
  for (const m of text.matchAll(/"([^"]+)"/g)) found.push(m[1].trim());
  if (!found.length && /^[A-Za-z°µ][A-Za-z0-9^/ ·°µ.]*$/.test(text.trim()) && text.trim().length <= 12) found.push(text.trim());
  return found;
}

/** The dimension and unit a piece of text declares, when it names a known unit. */
export function declaredUnit(text: string): { unit: string; dim: Dimension } | undefined {
  for (const u of unitsDeclared(text)) {
    const dim = dimensionOfUnit(u, ALL_DIMS);
    if (dim) return { unit: u, dim };
  }
  return undefined;
}

/**
 * Findings for one NAPPE call: each argument that was a single-cell reference holding a bare
 * number, whose label or number format declares a unit other than the one it was read in.
 */
export function checkCallUnits(spec: FunctionSpec, evaluation: Evaluation, refs: readonly (string | undefined)[], here: string, labels: LabelSource): UnitFinding[] {
  const findings: UnitFinding[] = [...implausibleMagnitudes(spec, evaluation, refs), ...tableFindings(spec, evaluation, refs, here, labels)];
  spec.params.forEach((p, i) => {
    const ref = refs[i];
    if (!ref || ref.includes(":") || p.kind !== "quantity" || !hasUnit(p.dim)) return;
    const reading = evaluation.readings.find((r) => r.name === p.name);
    if (!reading || reading.how !== "base unit" || typeof reading.raw !== "number") return;
    const { sheet, address } = splitReference(ref, here);
    const { row, col } = parseAddress(address);
    // The cell's own label, or the label of the input it copies through plain references.
    const onChain = declaredOnChain(labels, sheet, row, col, here);
    for (const { text, declared, cell, at, byLabel } of onChain ? [onChain] : []) {
      const labelled = cell === ref || `${sheetPrefix(sheet)}${cell}` === ref || cell === address ? `${ref} is labelled "${text}"` : `${ref} copies ${cell}, labelled "${text}",`;
      const base = DIMENSIONS[p.dim].base;
      if (declared.dim !== p.dim && !(DIMENSIONS[declared.dim].base === base)) {
        findings.push({ arg: p.name, ref, message: `${ref} is labelled "${text}" (${DIMENSIONS[declared.dim].noun.replace(/^an? /, "")}) but ${p.name} expects ${DIMENSIONS[p.dim].noun}.` });
        return;
      }
      const isBaseUnit = Math.abs(toBase(p.name, 1, p.dim, declared.unit) - 1) < 1e-12 && Math.abs(toBase(p.name, 0, p.dim, declared.unit)) < 1e-12;
      if (isBaseUnit) return;
      const fixRef = ref.includes("!") ? ref : address;
      findings.push({
        arg: p.name,
        ref,
        message: `${labelled} but its bare number ${reading.raw} is read as ${reading.raw} ${DIMENSIONS[p.dim].baseLabel}: join the unit, ${fixRef}&" ${declared.unit}", or correct the label.`,
        fix: `${fixRef}&" ${declared.unit}"`,
        unit: declared.unit,
        label: byLabel ? { ...at, text, corrected: relabelled(text, declared.unit, base) } : undefined,
      });
      return;
    }
  });
  return findings;
}

/**
 * Bare numbers whose size is implausible for their dimension in pump and pipe work (a bare
 * flow of 4000 is 4000 m³/s): usually a number meant in another unit.
 */
function implausibleMagnitudes(spec: FunctionSpec, evaluation: Evaluation, refs: readonly (string | undefined)[]): UnitFinding[] {
  const findings: UnitFinding[] = [];
  spec.params.forEach((p, i) => {
    if (p.kind !== "quantity") return;
    const range = p.plausible ?? (DIMENSIONS[p.dim] as { plausible?: readonly [number, number] }).plausible;
    const reading = evaluation.readings.find((r) => r.name === p.name);
    if (!range || !reading || reading.how !== "base unit" || typeof reading.value !== "number" || reading.value === 0) return;
    const size = Math.abs(reading.value);
    if (size >= range[0] && size <= range[1]) return;
    const where = refs[i] ?? "the formula";
    findings.push({
      arg: p.name,
      ref: where,
      message: `${p.name} is a bare ${formatNumber(reading.value)} read as ${formatNumber(reading.value)} ${DIMENSIONS[p.dim].baseLabel}, an implausible ${DIMENSIONS[p.dim].noun.replace(/^an? /, "")} (usual: ${range[0]} to ${range[1]} ${DIMENSIONS[p.dim].baseLabel}); if another unit was meant, write it with the number, such as ${DIMENSIONS[p.dim].example}.`,
    });
  });
  return findings;
}

