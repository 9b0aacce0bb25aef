/**
 * Reading worksheet values as quantities and writing results in a requested unit.
 * A bare number is in the dimension's base unit; text is a number followed by a unit
 * ("4000 gpm", "150 mm", "68 degF"); only that form is accepted, never an expression.
 * Parsed text and unit conversions are cached; the common units' factors come from a table
 * generated with mathjs (unitFactors.ts), so mathjs itself is set up only for other units.
 */
import { CalcError } from "../calc/_lib/result";
import { type Dimension, DIMENSIONS, hasUnit } from "./dimensions";
import { type MathUnit, quantity, unitOf } from "./mathjs";
import { UNIT_FACTORS } from "./unitFactors";

const CACHE_LIMIT = 5000;
const ALL_DIMENSIONS = Object.keys(DIMENSIONS) as Dimension[];
/** Caches by dimension, then by text: no key strings to build on the hot path. */
const quantityCache = new Map<Dimension, Map<string, ParsedQuantity>>();
const unitCache = new Map<Dimension, Map<string, UnitConversion>>();

function cacheFor<T>(caches: Map<Dimension, Map<string, T>>, dim: Dimension): Map<string, T> {
  let m = caches.get(dim);
  if (!m) caches.set(dim, (m = new Map()));
  return m;
}

/** A text quantity read into base units. */
interface ParsedQuantity {
  /** Value in the dimension's base unit. */
  base: number;
  /** The number as written. */
  number: number;
  /** The unit as written ("gpm"), or "%" for percent. */
  unit: string;
}

/** How a unit converts to a dimension's base unit: base = (x + offset) · factor − baseOffset. */
interface UnitConversion {
  unit: string;
  toBase: (x: number) => number;
  fromBase: (x: number) => number;
}

const NUMBER_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const QUANTITY_TEXT = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([A-Za-z_°µΩ][A-Za-z0-9_^/*·.()\s°µΩ-]*)$/;

function remember<T>(cache: Map<string, T>, key: string, value: T): T {
  if (cache.size >= CACHE_LIMIT) cache.clear();
  cache.set(key, value);
  return value;
}

/** Parses numeric text ("12.5", "1e-3") or returns undefined. */
export function parseNumberText(text: string): number | undefined {
  const t = text.trim();
  return NUMBER_TEXT.test(t) ? Number(t) : undefined;
}

function describeUnitProblem(arg: string, text: string, dim: Dimension): CalcError {
  const info = DIMENSIONS[dim];
  if (/\d,\d/.test(text)) {
    return new CalcError(arg, `"${text}" has a comma: write the number with a decimal point and no thousands separator, such as ${info.example}`, "value");
  }
  return new CalcError(arg, `could not read "${text}" as ${info.noun}: expected a number and a unit such as ${info.example}, or a bare number in ${info.baseLabel}`, "value");
}

/** Normalises unit spellings engineers type that mathjs writes otherwise. */
function normaliseUnitText(unit: string): string {
  return unit
    .trim()
    // Gallons say which: "US gpm" is the US gallon (as a bare gpm is); "UK gpm" and "imp gpm" the imperial one.
    .replace(/^US\s+(?=gal|gpm)/i, "")
    .replace(/^(?:UK|imp\.?|imperial)\s*gpm$/i, "igpm")
    .replace(/^(?:UK|imp\.?|imperial)\s*gal(?:lons?)?\b/i, "igal")
    .replace(/°\s*C\b/g, "degC")
    .replace(/°\s*F\b/g, "degF")
    .replace(/·/g, " ")
    .replace(/²/g, "^2")
    .replace(/³/g, "^3")
    .replace(/\bµ/g, "u");
}

/** Conversion between a unit name and a dimension's base unit (cached). */
function conversionFor(arg: string, unitText: string, dim: Dimension): UnitConversion {
  const cache = cacheFor(unitCache, dim);
  const hit = cache.get(unitText);
  if (hit) return hit;
  const info = DIMENSIONS[dim];
  // A common unit: its factor was worked out by mathjs when the table was generated.
  const known = UNIT_FACTORS[dim]?.[normaliseUnitText(unitText)];
  if (known !== undefined) return remember(cache, unitText, { unit: unitText, toBase: (x) => x * known, fromBase: (x) => x / known });
  let unit: MathUnit;
  try {
    unit = unitOf(normaliseUnitText(unitText));
  } catch {
    throw new CalcError(arg, `unknown unit "${unitText}": expected a unit of ${info.noun.replace(/^an? /, "")} such as ${info.example}`, "value");
  }
  if (!unit.equalBase(unitOf(info.base))) {
    const actual = dimensionOfUnit(unitText, ALL_DIMENSIONS);
    const what = actual ? `is ${DIMENSIONS[actual].noun} unit, not ${info.noun}` : `is not ${info.noun} unit`;
    throw new CalcError(arg, `"${unitText}" ${what}: expected something like ${info.example}`, "value");
  }
  const name = normaliseUnitText(unitText);
  let conversion: UnitConversion;
  if (dim === "temperature") {
    conversion = {
      unit: unitText,
      toBase: (x) => quantity(x, name).toNumber(info.base),
      fromBase: (x) => quantity(x, info.base).toNumber(name),
    };
  } else {
    const factor = quantity(1, name).toNumber(info.base);
    conversion = { unit: unitText, toBase: (x) => x * factor, fromBase: (x) => x / factor };
  }
  return remember(cache, unitText, conversion);
}

/**
 * Reads text as a quantity of the given dimension, in base units. Percent is accepted for
 * the dimensionless kinds ("78%" → 0.78). Throws a CalcError naming `arg` otherwise.
 */
export function parseQuantity(arg: string, text: string, dim: Dimension): ParsedQuantity {
  const cache = cacheFor(quantityCache, dim);
  const hit = cache.get(text);
  if (hit) return hit;
  const t = text.trim();
  const bare = parseNumberText(t);
  if (bare !== undefined) return remember(cache, text, { base: bare, number: bare, unit: "" });
  if (!hasUnit(dim)) {
    const percent = /^(.*\S)\s*%$/.exec(t);
    const n = percent ? parseNumberText(percent[1]) : undefined;
    if (n === undefined) {
      throw new CalcError(arg, `could not read "${text}" as ${DIMENSIONS[dim].noun}: expected ${DIMENSIONS[dim].example}`, "value");
    }
    return remember(cache, text, { base: n / 100, number: n, unit: "%" });
  }
  const m = QUANTITY_TEXT.exec(t);
  if (!m) throw describeUnitProblem(arg, text, dim);
  const number = Number(m[1]);
  const conversion = conversionFor(arg, m[2].trim(), dim);
  const base = conversion.toBase(number);
  if (!Number.isFinite(number) || !Number.isFinite(base)) {
    throw new CalcError(arg, `"${text}" is too large to use`, "num");
  }
  return remember(cache, text, { base, number, unit: m[2].trim() });
}

/** Converts a base-unit value to `unitText`, which must be a unit of `dim`. */
export function fromBase(arg: string, value: number, dim: Dimension, unitText: string): number {
  return conversionFor(arg, unitText, dim).fromBase(value);
}

/** Converts a base-unit value of `dim` given in `unitText` to base units. */
export function toBase(arg: string, value: number, dim: Dimension, unitText: string): number {
  return conversionFor(arg, unitText, dim).toBase(value);
}

/** Which dimension a unit name belongs to, among those listed, or undefined. */
export function dimensionOfUnit(unitText: string, among: readonly Dimension[]): Dimension | undefined {
  let unit: MathUnit;
  try {
    unit = unitOf(normaliseUnitText(unitText));
  } catch {
    return undefined;
  }
  return among.find((d) => hasUnit(d) && unit.equalBase(unitOf(DIMENSIONS[d].base)));
}

/**
 * Converts between any two units of the same dimension (the CONVERT function), with
 * temperature offsets handled. Throws naming from_unit or to_unit.
 */
export function convertUnits(value: number, fromUnit: string, toUnit: string): number {
  let from: MathUnit;
  let to: MathUnit;
  try {
    from = unitOf(normaliseUnitText(fromUnit));
  } catch {
    throw new CalcError("from_unit", `unknown unit "${fromUnit}": expected a unit name such as "gpm", "psi" or "m^3/h"`, "value");
  }
  try {
    to = unitOf(normaliseUnitText(toUnit));
  } catch {
    throw new CalcError("to_unit", `unknown unit "${toUnit}": expected a unit name such as "L/s", "kPa" or "ft"`, "value");
  }
  if (!from.equalBase(to)) {
    throw new CalcError("to_unit", `"${toUnit}" measures something other than "${fromUnit}": expected a unit of the same dimension`, "value");
  }
  return quantity(value, normaliseUnitText(fromUnit)).toNumber(normaliseUnitText(toUnit));
}

/** A value given in a unit, in SI base units: the number and the SI unit ("kg / (m s^2)"), for a conversion's audit trail. */
export function inSiBaseUnits(value: number, fromUnit: string): { value: number; unit: string } {
  // mathjs keeps every unit's value in SI base units; its dimensions are powers of kg, m, s, A, K, cd, mol, rad, bit.
  const q = quantity(value, normaliseUnitText(fromUnit)) as MathUnit & { value: number; dimensions: number[] };
  const names = ["kg", "m", "s", "A", "K", "cd", "mol", "rad", "bit"];
  const unit = q.dimensions.flatMap((p, i) => (p === 0 ? [] : [p === 1 ? names[i] : `${names[i]}^${p}`])).join(" ");
  return { value: q.value, unit };
}
