/**
 * The one model of an explained NAPPE call. The pane's cell view, the audit entries, the HTML
 * report, the text table and both audit sheets are all built from it: each argument as written,
 * as read (value, unit and why) and in base units; the result in the unit asked for and in base
 * units (carried by the evaluation, never recomputed); assumptions, checks, warnings, the unit
 * check's findings, cautions and sources.
 */
import type { ArgReading, Evaluation } from "../functions/bind/evaluate";
import type { FunctionSpec } from "../functions/catalog/types";
import { CATALOG_BY_ID } from "../functions/catalog";
import { resultDimension } from "../functions/catalog/types";
import type { Table } from "../functions/tables/table";
import type { Step } from "../functions/calc/_lib/result";
import { type Dimension, DIMENSIONS } from "../functions/units/dimensions";
import { fromBase } from "../functions/units/quantity";
import { formatNumber, formatPercent, formatQuantity, formatUnit, labelledSpill, shortenQuantityText, type SpillTable } from "./format";
import type { CallSite } from "./formula";
import type { CallRecord } from "./recalc";
import { checkCallUnits, type LabelSource, type UnitFinding } from "./unitCheck";

interface ArgView {
  name: string;
  /** As written in the formula ("Inputs!B14", "\"6 in\"", B11&" m^3/h"), or "" when left out. */
  written: string;
  /** The value as read, for people ("2 bar", "0.78", "6 rows"). */
  value: string;
  /** The unit it was read in. */
  unit: string;
  /** Why that unit: bare number (base unit), text quantity, percent, table header, default. */
  why: string;
  /** The base-unit value with its unit, or a table's columns and their units. */
  base: string;
}

/** An intermediate value as a hand calculation writes it: "Re = 1.2e5 (Reynolds number; Re = VD/ν)". */
interface StepView {
  symbol: string;
  name: string;
  /** The value with its unit, in US customary units when the call's flow or a length was given in them, else SI. */
  value: string;
  how: string;
}

export interface CallView {
  id: string;
  purpose: string;
  equation: string;
  args: ArgView[];
  /** The calculation's intermediate values, in the order it finds them. */
  steps: StepView[];
  /** The equation with this call's numbers put in (in the units of the steps), when the spec writes one. */
  substituted?: string;
  /** The result in the unit the formula asks for (its `unit` argument, else the base unit). */
  result?: string;
  /** The result in the base unit of its dimension. */
  resultBase?: string;
  /** A spilled result as a small labelled table (header row with units, then its rows). */
  table?: SpillTable;
  assumptions: readonly string[];
  checks: readonly string[];
  warnings: readonly string[];
  /** Bare numbers read from cells labelled in another unit, and implausible magnitudes. */
  unitFindings: UnitFinding[];
  /** A kept cross-check's diagnosis, line by line (crossCheck.ts): the verdict, the steps that depart, the causes. */
  diagnosis: string[];
  cautions: readonly string[];
  sources: readonly string[];
  error?: string;
}

function howWhy(r: ArgReading): { unit: string; why: string } {
  switch (r.how) {
    case "base unit":
      return { unit: r.unit, why: "bare number, so the base unit" };
    case "text quantity":
      return { unit: r.unit, why: "unit written with the number" };
    case "percent":
      return { unit: "%", why: "percent text" };
    case "default":
      return { unit: r.unit, why: "left out, so the default" };
    case "table":
      return { unit: "", why: "units from the header row (base units without one)" };
    default:
      return { unit: "", why: r.how };
  }
}

/** Which gallon a flow unit means, said every time: a bare gal or gpm is the US gallon. */
function gallonNote(unit: string): string {
  if (/^(?:UK|imp\.?|imperial)\s*g|^ig(?:al|pm)/i.test(unit.trim())) return " (imperial gallons, 4.54609 L)";
  return /\bgal|gpm|MGD/i.test(unit) ? " (US gallons, 3.785 L)" : "";
}

function describeArg(r: ArgReading, written: string, baseUnit: string): ArgView {
  const { unit: writtenUnit, why } = howWhy(r);
  const unit = formatUnit(writtenUnit);
  if (r.how === "table") {
    const t = r.value as Table;
    const cols = t.columns.map((c) => `${c.header ?? c.role} → ${c.role} in ${formatUnit(c.unit) || DIMENSIONS[c.dim].baseLabel}${gallonNote(c.unit)}${c.unitFrom === "units row" ? ", unit from the units row" : ""}`).join("; ");
    return { name: r.name, written, value: `${t.rows} ${t.rows === 1 ? "row" : "rows"}`, unit: "", why, base: cols };
  }
  const raw = r.raw === null || r.raw === undefined ? undefined : Array.isArray(r.raw) ? "(range)" : typeof r.raw === "number" ? formatNumber(r.raw) : shortenQuantityText(String(r.raw));
  if (typeof r.value !== "number") return { name: r.name, written, value: raw ?? String(r.value), unit, why, base: String(r.value) };
  const base = baseUnit === "(fraction)" ? `fraction, ${formatPercent(r.value)}` : formatQuantity(r.value, baseUnit);
  return { name: r.name, written, value: raw ?? formatNumber(r.value), unit, why, base };
}

/** The units intermediate values are shown in when a call's inputs are in US customary units. */
const US_UNITS: Partial<Record<Dimension, string>> = { length: "ft", area: "ft^2", flow: "gpm", velocity: "ft/s", pressure: "psi", power: "hp", kinematicViscosity: "ft^2/s", density: "lb/ft^3" };
const US_UNIT_TEXT = /^(gpm|gal\/min|MGD|cfs|cfm|ft|feet|foot|in|inch|inches|yd|mi|mile|ftH2O|inH2O|psi|psia|ft\/s|ft\^3\/s|hp)$/i;

/** The units a call's numbers are shown in: one system through and through, the units the user wrote where they belong to it. */
interface Shown {
  us: boolean;
  /** Units the user wrote, by dimension, in that system: the unit asked for the result, then the inputs' text quantities. */
  units: Partial<Record<Dimension, string>>;
}

/**
 * The system of the result the user asked for (its `unit` argument); without one, US customary
 * when the call's flow or a length (or a table column of them) was given in US units, else SI.
 */
function shownFor(ev: Evaluation, spec: FunctionSpec): Shown {
  const asked = ev.readings.find((r) => r.name === "unit" && r.how === "unit name" && typeof r.value === "string")?.value as string | undefined;
  const us =
    asked && ev.dim !== "ratio" && ev.dim !== "efficiency"
      ? US_UNIT_TEXT.test(asked.trim())
      : ev.readings.some((r) => {
          if (r.how === "text quantity") return US_UNIT_TEXT.test(r.unit.trim());
          if (r.how === "table") return (r.value as Table).columns.some((c) => (c.dim === "flow" || c.dim === "length") && US_UNIT_TEXT.test(c.unit.trim()));
          return false;
        });
  const units: Partial<Record<Dimension, string>> = {};
  if (asked && ev.unit) units[ev.dim] = ev.unit;
  for (const r of ev.readings) {
    if (r.how !== "text quantity" || !r.unit) continue;
    const p = spec.params.find((x) => x.name === r.name);
    const dim = p?.kind === "quantity" ? p.dim : undefined;
    if (dim && !units[dim] && US_UNIT_TEXT.test(r.unit.trim()) === us && dim !== "temperature") units[dim] = r.unit;
  }
  return { us, units };
}

/** Energy reads in kWh in either system (joules of a year's pumping are 1e11). */
const SHOWN_UNITS: Partial<Record<Dimension, string>> = { energy: "kWh" };

/** The unit a value of `dim` is shown in: the one the user wrote for it, else the system's. */
function shownUnit(dim: Dimension, s: Shown): string {
  return s.units[dim] || (s.us && US_UNITS[dim]) || SHOWN_UNITS[dim] || DIMENSIONS[dim].base;
}

/** A base-unit value in the unit it is shown in, with that unit; an efficiency as percent. */
function shown(value: number, dim: Dimension, s: Shown, unit = shownUnit(dim, s), digits?: number): string {
  if (dim === "efficiency" && unit === "") return formatPercent(value);
  return formatQuantity(unit === DIMENSIONS[dim].base ? value : fromBase("value", value, dim, unit), unit, digits);
}

/** The result as the view shows it: in the unit asked for, an efficiency as percent, a spill as its rows. */
function resultText(ev: Evaluation): string {
  if (typeof ev.value !== "number") return `spills ${ev.value.length} ${ev.value.length === 1 ? "row" : "rows"}, as the table shows`;
  if (ev.dim === "efficiency" && ev.unit === "") return `${formatNumber(ev.value)} (${formatPercent(ev.value)})`;
  return formatQuantity(ev.value, ev.unit);
}

function stepView(s: Step, units: Shown): StepView {
  return { symbol: s.symbol, name: s.name, value: shown(s.value, s.dim, units), how: s.how };
}

/** Standard gravity (NIST SP 811) as a derivation line writes it. */
const GRAVITY = { si: "9.80665 m/s²", us: "32.174 ft/s²" };

/**
 * The spec's derivation line with the numbers of one evaluation, so that it multiplies out: in
 * the system of the result asked for (US customary or SI, coherent units), the result's own
 * dimension in the unit asked for.
 */
function substitutedLine(spec: FunctionSpec, ev: Evaluation, shownUnits: Shown): string | undefined {
  const us = shownUnits.us;
  // The equation multiplies out: its numbers in the system's coherent units, the result's own dimension in the unit asked.
  const units: Shown = { us, units: shownUnits.units[ev.dim] ? { [ev.dim]: shownUnits.units[ev.dim] } : {} };
  const derivation = spec.derivation;
  if (!derivation) return undefined;
  const missing = () => {
    throw new Error("a number the derivation names is missing");
  };
  const arg = (name: string, unit?: string, digits?: number) => {
    const r = ev.readings.find((x) => x.name === name);
    if (r && typeof r.value === "string") return r.value;
    if (!r || typeof r.value !== "number") return missing();
    const p = spec.params.find((x) => x.name === name);
    if (p?.kind === "quantity") return shown(r.value, p.dim, units, unit ?? shownUnit(p.dim, units), digits);
    // A value whose dimension another argument sets (AFFINITY's value) has the result's dimension.
    return p?.kind === "anyQuantity" ? shown(r.value, ev.dim, units, unit ?? shownUnit(ev.dim, units), digits) : formatQuantity(r.value, "", digits);
  };
  const stepValue = (symbol: string) => {
    const s = ev.steps.find((x) => x.symbol === symbol);
    return s ? shown(s.value, s.dim, units) : missing();
  };
  try {
    const result = typeof ev.base === "number" ? shown(ev.base, ev.dim, units) : "";
    const has = (symbol: string) => ev.steps.some((x) => x.symbol === symbol);
    return derivation({ arg, step: stepValue, has, result, g: us ? GRAVITY.us : GRAVITY.si, us });
  } catch {
    return undefined;
  }
}

/** As written when the formula's text is not at hand: the reference, or the literal passed. */
function writtenFrom(raw: unknown, ref: string | undefined): string {
  if (ref) return ref;
  if (raw === null || raw === undefined) return "";
  if (typeof raw === "string") return `"${raw}"`;
  if (Array.isArray(raw)) return "(array)";
  return String(raw);
}

/**
 * The view of one recorded call. `site` (the call's place in the formula) gives each argument
 * as written; `sheet` and `labels` let the unit check read labels and number formats.
 */
export function callView(rec: CallRecord, site: CallSite | undefined, sheet: string, labels?: LabelSource): CallView {
  const spec = CATALOG_BY_ID.get(rec.id)!;
  const ev = rec.evaluation;
  const args = spec.params.flatMap((p, i) => {
    const r = ev?.readings.find((x) => x.name === p.name);
    const written = site?.args[i]?.text ?? writtenFrom(r?.raw, rec.refs[i]);
    if (!r) return written ? [{ name: p.name, written, value: "", unit: "", why: "", base: "" }] : [];
    const dim = p.kind === "quantity" ? p.dim : p.kind === "anyQuantity" && ev ? resultDimension(spec, Object.fromEntries(ev.readings.map((x) => [x.name, x.value]))) : undefined;
    return [describeArg(r, written, dim ? DIMENSIONS[dim].base || (dim === "efficiency" ? "(fraction)" : "") : "")];
  });
  const numeric = ev && typeof ev.value === "number" && typeof ev.base === "number";
  const units = ev ? shownFor(ev, spec) : { us: false, units: {} };
  return {
    id: rec.id,
    purpose: spec.purpose,
    equation: spec.equation,
    args,
    steps: ev ? ev.steps.map((s) => stepView(s, units)) : [],
    substituted: ev ? substitutedLine(spec, ev, units) : undefined,
    result: ev ? resultText(ev) : undefined,
    resultBase: numeric && ev.dim !== "efficiency" ? formatQuantity(ev.base as number, DIMENSIONS[ev.dim].base) : undefined,
    table: ev && typeof ev.value !== "number" ? labelledSpill(ev.value, ev.header) : undefined,
    assumptions: spec.assumptions,
    checks: spec.validity,
    // A kept check's own "Differs" warning is said in full by its diagnosis.
    warnings: (ev?.warnings ?? []).filter((w) => !(rec.diagnosis && /^Differs: the hand value/.test(w))),
    unitFindings: ev && labels ? checkCallUnits(spec, ev, rec.refs, sheet, labels) : [],
    diagnosis: rec.diagnosis?.lines ?? [],
    cautions: spec.cautions,
    sources: spec.sources,
    error: rec.error?.message,
  };
}

/** Pairs recorded calls with their places in the formula (both in evaluation order). */
export function pairCalls(records: readonly CallRecord[], sites: readonly CallSite[]): (CallSite | undefined)[] {
  const nappe = sites.filter((s) => s.name.startsWith("NAPPE."));
  const used = new Set<CallSite>();
  return records.map((rec) => {
    const site = nappe.find((s) => !used.has(s) && s.name === `NAPPE.${rec.id}`);
    if (site) used.add(site);
    return site;
  });
}
