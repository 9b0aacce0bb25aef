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
import { parseAddress, splitReference } from "./address";

export interface LabelSource {
  /** Text of the nearest label cells: to the left on the same row, then above. */
  labelsNear(sheet: string, row: number, col: number): string[];
  /** The cell's number format, if any. */
  numberFormat(sheet: string, row: number, col: number): string | undefined;
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
  const findings: UnitFinding[] = [...implausibleMagnitudes(spec, evaluation, refs)];
  spec.params.forEach((p, i) => {
    const ref = refs[i];
    if (!ref || ref.includes(":") || p.kind !== "quantity" || !hasUnit(p.dim)) return;
    const reading = evaluation.readings.find((r) => r.name === p.name);
    if (!reading || reading.how !== "base unit" || typeof reading.raw !== "number") return;
    const { sheet, address } = splitReference(ref, here);
    const { row, col } = parseAddress(address);
    const sources = [labels.numberFormat(sheet, row, col), ...labels.labelsNear(sheet, row, col)].filter((t): t is string => Boolean(t));
    for (const text of sources) {
      const declared = declaredUnit(text);
      if (!declared) continue;
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
        message: `${ref} is labelled "${text}" but its bare number ${reading.raw} is read as ${reading.raw} ${DIMENSIONS[p.dim].baseLabel}: join the unit, ${fixRef}&" ${declared.unit}", or correct the label.`,
        fix: `${fixRef}&" ${declared.unit}"`,
        unit: declared.unit,
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
      message: `${p.name} is a bare ${short(reading.value)} read as ${short(reading.value)} ${DIMENSIONS[p.dim].baseLabel}, an implausible ${DIMENSIONS[p.dim].noun.replace(/^an? /, "")} (usual: ${range[0]} to ${range[1]} ${DIMENSIONS[p.dim].baseLabel}); if another unit was meant, write it with the number, such as ${DIMENSIONS[p.dim].example}.`,
    });
  });
  return findings;
}

/** Six significant figures, as people read numbers. */
function short(x: number): string {
  return String(Number(x.toPrecision(6)));
}
