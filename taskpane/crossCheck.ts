/**
 * Cross-check of a hand formula (pure: it reads the workbook through the HostPort). The
 * reviewer picks the quantity a plain formula computes; Nappe maps its inputs from the
 * formula's precedents by label and unit ("Flow (gpm)" → flow), computes the same quantity,
 * and says whether the hand value agrees within a tolerance. Whatever the verdict, every step
 * of the hand calculation that departs from Nappe's by more than 0.01 % is named, the first
 * one found in the order of the calculation, with the usual causes (an explicit friction
 * formula, g = 9.81, a density of 1000, gauge for absolute pressure, a gpm/ft³/s slip).
 */
import { evaluate, type Evaluation, type RawArg } from "../functions/bind/evaluate";
import { formulaLibraryReady } from "../workbook/formulaLibrary";
import type { Step } from "../functions/calc/_lib/result";
import { haalandFriction, swameeJainFriction } from "../functions/calc/friction";
import { CATALOG_BY_ID } from "../functions/catalog";
import type { FunctionSpec, ParamSpec } from "../functions/catalog/types";
import { type Dimension, DIMENSIONS } from "../functions/units/dimensions";
import { toBase } from "../functions/units/quantity";
import { addressOf, sheetPrefix } from "../workbook/address";
import { formatNumber } from "../workbook/format";
import { directPrecedents } from "../workbook/formula";
import { parseAddress } from "../workbook/model";
import { declaredUnit } from "../workbook/unitCheck";
import type { HostPort } from "./host/port";

/** A cell the hand calculation reads, with what the pane needs to map and compare it. */
interface HandCell {
  sheet: string;
  address: string;
  value: unknown;
  formula?: string;
  /** The label to its left or above ("Flow (gpm)"). */
  label: string;
  /** The unit its label or number format declares, if any. */
  unit?: { unit: string; dim: Dimension };
}

interface CrossCheckResult {
  specId: string;
  hand: HandCell;
  /** Argument → the cell (or text) it was read from. */
  mapping: Record<string, string>;
  nappe: Evaluation;
  /** Hand and Nappe values in the hand cell's unit (the base unit when its label names none). */
  handValue: number;
  nappeValue: number;
  unit: string;
  relativeDifference: number;
  tolerance: number;
  verdict: "agrees" | "differs";
  /** Every step departing by more than 0.01 %, first departure first. */
  departures: string[];
  /** The usual causes the formulas and numbers point to. */
  causes: string[];
  /** A formula that keeps the cross-check in the workbook. */
  keepFormula: string;
}

/** A step that departs by more than this is named, whatever the verdict. */
const STEP_TOLERANCE = 1e-4;

function label(labels: string[]): string {
  return labels.find((l) => !/^[-+]?\d/.test(l)) ?? "";
}

async function handCell(port: HostPort, sheet: string, address: string): Promise<HandCell> {
  const c = await port.cell(sheet, address);
  const text = label(await port.labelsNear(sheet, address));
  const unit = (c.numberFormat && declaredUnit(c.numberFormat)) || declaredUnit(text);
  return { sheet, address, value: c.value, formula: c.formula, label: text, unit };
}

/** The cells a hand formula reads, its own intermediate formulas first followed down a few levels. */
async function handPrecedents(port: HostPort, cell: HandCell, depth = 4): Promise<HandCell[]> {
  const seen = new Map<string, HandCell>();
  const walk = async (c: HandCell, level: number) => {
    if (!c.formula || level > depth) return;
    const { row, col } = parseAddress(c.address);
    let refs: ReturnType<typeof directPrecedents> = [];
    try {
      refs = directPrecedents(c.formula, { sheet: c.sheet, row, col });
    } catch {
      refs = [];
    }
    for (const ref of refs) {
      if (ref.from) continue; // ranges are tables, not single inputs
      const address = addressOf(ref.row!, ref.col!);
      const key = `${ref.sheet}!${address}`;
      if (seen.has(key)) continue;
      const p = await handCell(port, ref.sheet, address);
      seen.set(key, p);
      await walk(p, level + 1);
    }
  };
  await walk(cell, 0);
  return [...seen.values()];
}

const WORDS: Record<string, RegExp> = {
  flow: /\bflow|\bQ\b|discharge|capacity/i,
  diameter: /diam|\bID\b|bore|\bD\b/i,
  length: /length|\bL\b|run/i,
  roughness: /rough|\bε|\beps/i,
  kinematic_viscosity: /kinematic|\bν|\bnu\b/i,
  density: /density|\bρ|\brho/i,
  head: /head|\bH\b|lift/i,
  efficiency: /effic|\bη/i,
  temperature: /temp/i,
  surface_pressure: /pressure|atm/i,
  liquid_height: /level|height|lift|elev|\bz\b/i,
  suction_loss: /loss/i,
  velocity: /veloc|\bV\b/i,
  reynolds: /reynolds|\bRe\b/i,
  relative_roughness: /relative rough|ε\/D|e\/D/i,
};

/** Suggests, for each parameter, the precedent that feeds it: by label words and declared unit. */
function suggestMapping(spec: FunctionSpec, cells: readonly HandCell[]): Record<string, HandCell | undefined> {
  const inputs = cells.filter((c) => !c.formula && typeof c.value === "number");
  const used = new Set<HandCell>();
  const out: Record<string, HandCell | undefined> = {};
  for (const p of spec.params) {
    if (p.kind !== "quantity") continue;
    const words = WORDS[p.name];
    const fits = (c: HandCell) => !used.has(c) && (!c.unit || c.unit.dim === p.dim) && (words ? words.test(c.label) : false);
    const best = inputs.find((c) => fits(c) && c.unit?.dim === p.dim) ?? inputs.find(fits);
    if (best) {
      out[p.name] = best;
      used.add(best);
    }
  }
  return out;
}

/** The argument as a formula would pass it: the cell joined with its label's unit, or the bare number. */
function rawOf(c: HandCell): RawArg {
  return c.unit ? `${c.value as number} ${c.unit.unit}` : (c.value as number);
}

function refOf(c: HandCell, here: string): string {
  return `${c.sheet === here ? "" : sheetPrefix(c.sheet)}${c.address}`;
}

function inBase(c: HandCell, value: number, dim: Dimension): number {
  return c.unit && c.unit.dim === dim ? toBase(c.label, value, dim, c.unit.unit) : value;
}

/** Hand intermediate cells matched to Nappe's steps: by label words, else by a value within 10 %. */
function matchSteps(steps: readonly Step[], cells: readonly HandCell[]): { cell: HandCell; step: Step; hand: number }[] {
  const out: { cell: HandCell; step: Step; hand: number }[] = [];
  const used = new Set<Step>();
  const fullName = (s: Step) => s.name.toLowerCase().split(/[,:(]/)[0].trim();
  const score = (s: Step, text: string) => {
    if (text.includes(fullName(s))) return 3;
    if (new RegExp(`(^|[^A-Za-z])${s.symbol.replace(/[.*+?^${}()|[\]\\/]/g, "\\$&")}([^A-Za-z]|$)`).test(text)) return 2;
    // A distinctive word of the name ("velocity" of "mean velocity"), unless the label names another step in full.
    if (steps.some((o) => o !== s && text.includes(fullName(o)))) return 0;
    return fullName(s).split(/\s+/).some((w) => w.length >= 5 && !["above", "there", "given"].includes(w) && text.includes(w)) ? 1 : 0;
  };
  for (const c of cells.filter((x) => x.formula && typeof x.value === "number")) {
    const text = c.label.toLowerCase();
    const ranked = steps.filter((s) => !used.has(s)).map((s) => ({ s, n: score(s, text) })).filter((x) => x.n > 0).sort((a, b) => b.n - a.n);
    const byLabel = ranked[0]?.s;
    const hand = (s: Step) => inBase(c, c.value as number, s.dim);
    const step = byLabel ?? steps.find((s) => !used.has(s) && Math.abs(hand(s) / s.value - 1) < 0.1);
    if (step) {
      used.add(step);
      out.push({ cell: c, step, hand: hand(step) });
    }
  }
  // In the order Nappe finds them, so the first departure comes first.
  return out.sort((a, b) => steps.indexOf(a.step) - steps.indexOf(b.step));
}

const GPM_PER_CFS = 448.8311688311688; // NIST SP 811: 1 ft³/s = 448.831 US gal/min

/** The usual causes a hand calculation's constants and numbers point to. */
function causesOf(spec: FunctionSpec, formulas: string, ratio: number, departed: { cell: HandCell; step: Step; hand: number }[], nappe: Evaluation, cells: readonly HandCell[]): string[] {
  const causes: string[] = [];
  const has = (re: RegExp) => re.test(formulas);
  if (has(/(^|[^\d.])9\.81(?!\d)/)) causes.push("g = 9.81 m/s² used instead of standard gravity 9.80665 m/s² (0.034 %)");
  if (has(/(^|[^\d.])32\.2(?!\d)/) || has(/(^|[^\d.])32\.17(?!\d)/)) causes.push("g = 32.2 ft/s² used instead of standard gravity 32.174 ft/s²");
  const density = nappe.readings.find((r) => r.name === "density");
  // 1000 (or 62.4) as a density: next to g in the formula, not a mere kPa-to-Pa factor.
  if ((has(/(^|[^\d.])1000\s*\*\s*(9\.8|32\.\d)|(9\.8\d*|32\.\d+)\s*\*\s*1000(?![\d.])/) || has(/(^|[^\d.])62\.4(?!\d)/)) && density && typeof density.value === "number" && Math.abs(density.value / 1000 - 1) > 1e-4) {
    causes.push(`density 1000 kg/m³ (62.4 lb/ft³) used instead of water at its temperature (${formatNumber(density.value)} kg/m³)`);
  }
  if (has(/5\.74/) || has(/0\.25\s*\/\s*LOG10/i)) causes.push("an explicit friction formula (Swamee–Jain) instead of Colebrook");
  if (has(/1\.8\s*\*\s*LOG10/i) || has(/6\.9\s*\//)) causes.push("an explicit friction formula (Haaland) instead of Colebrook");
  const f = departed.find((d) => d.step.symbol === "f");
  const rr = nappe.steps.find((s) => s.symbol === "ε/D");
  // Fully rough (von Kármán): 1/√f = −2 log₁₀(ε/3.7D), no Reynolds number.
  if (f && rr && rr.value > 0 && Math.abs(f.hand * (2 * Math.log10(rr.value / 3.7)) ** 2 - 1) < 0.01) causes.push("a fully turbulent friction factor (independent of Re) where the flow is not fully rough");
  if (f && rr) {
    const re = nappe.steps.find((s) => s.symbol === "Re")!.value;
    if (Math.abs(f.hand / swameeJainFriction(re, rr.value) - 1) < 1e-4 && !causes.some((c) => c.includes("Swamee"))) causes.push("an explicit friction formula (Swamee–Jain) instead of Colebrook");
    if (Math.abs(f.hand / haalandFriction(re, rr.value) - 1) < 1e-4 && !causes.some((c) => c.includes("Haaland"))) causes.push("an explicit friction formula (Haaland) instead of Colebrook");
  }
  const slip = (r: number) => [GPM_PER_CFS, 1 / GPM_PER_CFS, GPM_PER_CFS ** 2, 1 / GPM_PER_CFS ** 2].some((k) => Math.abs(r / k - 1) < 0.01);
  if (slip(ratio) || departed.some((d) => slip(d.hand / d.step.value))) causes.push("a gpm / ft³/s slip (a factor of 448.8): a flow in gpm used as ft³/s, or the reverse");
  const pressure = spec.params.find((p) => p.name === "surface_pressure");
  if (pressure && cells.some((c) => /gauge|psig|barg|kpag/i.test(c.label))) causes.push("gauge pressure used where absolute is expected (add the atmospheric pressure, NAPPE.ATMPRESSURE)");
  return causes;
}

/**
 * Cross-checks the hand formula at sheet!address as the quantity `specId` computes. `mapping`
 * overrides the suggested inputs (argument → "B7" or a literal such as "20 degC").
 */
export async function crossCheckCell(port: HostPort, sheet: string, address: string, specId: string, options: { tolerance?: number; mapping?: Record<string, string> } = {}): Promise<CrossCheckResult> {
  await formulaLibraryReady();
  const spec = CATALOG_BY_ID.get(specId);
  if (!spec) throw new Error(`no function NAPPE.${specId}`);
  const hand = await handCell(port, sheet, address);
  if (typeof hand.value !== "number") throw new Error(`${sheet}!${address} holds no number to check`);
  const cells = await handPrecedents(port, hand);
  const suggested = suggestMapping(spec, cells);
  const raws: RawArg[] = [];
  const mapping: Record<string, string> = {};
  const written: string[] = [];
  for (const p of spec.params as readonly ParamSpec[]) {
    const chosen = options.mapping?.[p.name];
    const cell = chosen ? cells.find((c) => refOf(c, sheet) === chosen || c.address === chosen) : suggested[p.name];
    if (cell) {
      raws.push(rawOf(cell));
      mapping[p.name] = refOf(cell, sheet);
      written.push(cell.unit ? `${refOf(cell, sheet)}&" ${cell.unit.unit}"` : refOf(cell, sheet));
    } else if (chosen) {
      raws.push(chosen);
      mapping[p.name] = chosen;
      written.push(`"${chosen}"`);
    } else {
      raws.push(null);
      written.push("");
    }
  }
  const nappe = evaluate(spec, raws);
  if (typeof nappe.base !== "number") throw new Error(`NAPPE.${specId} spills a table: cross-check one of its values instead`);
  const dim = nappe.dim;
  const unit = hand.unit && hand.unit.dim === dim ? hand.unit.unit : DIMENSIONS[dim].base;
  const handBase = inBase(hand, hand.value, dim);
  const relativeDifference = (handBase - nappe.base) / nappe.base;
  const tolerance = options.tolerance ?? 0.005;
  const matched = matchSteps(nappe.steps, cells);
  const departed = matched.filter((m) => Math.abs(m.hand / m.step.value - 1) > STEP_TOLERANCE);
  const context = nappe.steps.filter((s) => ["Re", "ε/D"].includes(s.symbol)).map((s) => `${s.symbol} ${formatNumber(s.value)}`).join(", ");
  const departures = departed.map((d) => `${refOf(d.cell, sheet)} ${d.step.name} ${formatNumber(d.hand)} vs Nappe ${formatNumber(d.step.value)}${d.step.symbol === "f" && context ? ` at ${context}` : ""} (${d.step.how})`);
  if (Math.abs(relativeDifference) > STEP_TOLERANCE) departures.push(`${refOf(hand, sheet)} result ${formatNumber(hand.value)} vs Nappe ${formatNumber(toBaseBack(nappe.base, dim, unit))} ${unit}`.trimEnd());
  const formulas = [hand, ...cells].map((c) => c.formula ?? "").join(" ");
  const causes = causesOf(spec, formulas, handBase / nappe.base, departed, nappe, cells);
  // Nappe's value in the hand cell's unit, so that the kept formula compares like with like.
  const unitIndex = spec.params.findIndex((p) => p.name === "unit");
  if (unitIndex >= 0 && unit !== DIMENSIONS[dim].base) written[unitIndex] = `"${unit}"`;
  while (written.length && written[written.length - 1] === "") written.pop();
  const call = `NAPPE.${specId}(${written.join(", ")})`;
  return {
    specId,
    hand,
    mapping,
    nappe,
    handValue: hand.value,
    nappeValue: toBaseBack(nappe.base, dim, unit),
    unit,
    relativeDifference,
    tolerance,
    verdict: Math.abs(relativeDifference) <= tolerance ? "agrees" : "differs",
    departures,
    causes,
    keepFormula: `NAPPE.CROSSCHECK(${refOf(hand, sheet)}, ${call}, ${tolerance})`,
  };
}

function toBaseBack(base: number, dim: Dimension, unit: string): number {
  return unit === DIMENSIONS[dim].base ? base : base / toBase("unit", 1, dim, unit);
}
