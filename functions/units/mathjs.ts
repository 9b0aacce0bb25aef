/**
 * The project's one mathjs instance: units only (no expression parser is created, so user
 * text can never be evaluated). Nothing else imports mathjs.
 *
 * Trade units mathjs lacks are added here; where mathjs's own definition is rounded, it is
 * replaced by the exact one. Sources: NIST SP 811 (2008) appendix B.8 and B.9 factors; the
 * water columns are the conventional ones (1000 kg/m³ × standard gravity), as NIST SP 811 uses.
 */
import {
  create,
  createAbs,
  createAddScalar,
  createComplexClass,
  createCreateUnit,
  createDivideScalar,
  createFormat,
  createFractionClass,
  createIsNumeric,
  createMultiplyScalar,
  createNumber,
  createNumeric,
  createSubtractScalar,
  createTyped,
  createUnitClass,
  createUnitFunction,
  factory,
} from "mathjs";

/*
 * The Unit class and the two functions used, with their scalar dependencies only. mathjs's own
 * pow, round, fix and equal also handle matrices, which pulls in its whole matrix library (and
 * BigNumber, decimal.js): units of plain numbers need none of it. These factories give the same
 * numbers for numbers (pow as mathjs's number case: Math.pow, with its rule for infinite powers;
 * the others as Math.round, Math.trunc and equality within the configured relative tolerance).
 */
const createScalarPow = factory("pow", ["typed"], ({ typed }) =>
  typed("pow", {
    "number, number": (x: number, y: number) => {
      if ((x * x < 1 && y === Infinity) || (x * x > 1 && y === -Infinity)) return 0;
      if (Number.isInteger(y) || x >= 0) return Math.pow(x, y);
      throw new Error("a negative number to a fractional power has no real value");
    },
  }),
);
const createScalarRound = factory("round", ["typed"], ({ typed }) => typed("round", { number: (x: number) => Math.round(x) }));
const createScalarFix = factory("fix", ["typed"], ({ typed }) => typed("fix", { number: (x: number) => Math.trunc(x) }));
const createScalarEqual = factory("equal", ["typed", "config"], ({ typed, config }) =>
  typed("equal", { "number, number": (x: number, y: number) => x === y || Math.abs(x - y) <= (config as unknown as { relTol: number }).relTol * Math.max(Math.abs(x), Math.abs(y)) }),
);
/** BigNumber is never used (config.number stays "number"); the Unit class only needs the name. */
const createNoBigNumber = factory(
  "BigNumber",
  [],
  () =>
    class NoBigNumber {
      constructor() {
        throw new Error("BigNumber values are not supported: units are read as plain numbers");
      }
    },
  { isClass: true },
);
const unitFactories = {
  createUnitClass,
  createUnitFunction,
  createCreateUnit,
  createTyped,
  createAddScalar,
  createSubtractScalar,
  createMultiplyScalar,
  createDivideScalar,
  createNumeric,
  createAbs,
  createFormat,
  createNumber,
  createIsNumeric,
  createComplexClass,
  createFractionClass,
  createPow: createScalarPow,
  createRound: createScalarRound,
  createFix: createScalarFix,
  createEqual: createScalarEqual,
  createBigNumberClass: createNoBigNumber,
};

/**
 * The instance, made on first use: setting up mathjs's units is most of the worksheet bundle's
 * start-up, and the common units never need it (functions/units/unitFactors.ts).
 */
let instance: ReturnType<typeof create> | undefined;
function math(): ReturnType<typeof create> {
  if (!instance) {
    instance = create(unitFactories as unknown as Parameters<typeof create>[0]);
    for (const u of TRADE_UNITS) instance.createUnit(u.name, u.definition, { override: u.override === true });
  }
  return instance;
}

/** Each added unit: name, definition (a number and units mathjs knows), and the note the docs print. */
export const TRADE_UNITS: ReadonlyArray<{ name: string; definition: string; note: string; override?: boolean }> = [
  { name: "psi", definition: `${(0.45359237 * 9.80665) / 0.0254 ** 2} Pa`, note: "pound-force per square inch, exact (NIST SP 811: 6.894757E+03 Pa)", override: true },
  { name: "psia", definition: "1 psi", note: "psi, absolute (same factor; the function's parameter says absolute or not)" },
  { name: "ksi", definition: "1000 psi", note: "kilopound-force per square inch" },
  { name: "mmHg", definition: `${13595.1 * 9.80665 * 0.001} Pa`, note: "conventional millimetre of mercury, 133.322387415 Pa (NIST SP 811)", override: true },
  { name: "inHg", definition: `${13595.1 * 9.80665 * 0.0254} Pa`, note: "conventional inch of mercury, 3386.389 Pa (NIST SP 811)", override: true },
  { name: "mH2O", definition: `${1000 * 9.80665} Pa`, note: "conventional metre of water, 9806.65 Pa" },
  { name: "ftH2O", definition: `${1000 * 9.80665 * 0.3048} Pa`, note: "conventional foot of water, 2989.067 Pa (NIST SP 811)" },
  { name: "inH2O", definition: `${1000 * 9.80665 * 0.0254} Pa`, note: "conventional inch of water, 249.0889 Pa (NIST SP 811)" },
  { name: "gpm", definition: "1 gal/min", note: "US gallon (231 in³, 3.785411784 L) per minute" },
  { name: "MGD", definition: "1000000 gal/day", note: "million US gallons per day" },
  { name: "igal", definition: "4.54609 L", note: "imperial (UK) gallon, 4.54609 L exactly (written igal, UK gal or imp gal)" },
  { name: "igpm", definition: "1 igal/min", note: "imperial (UK) gallon per minute (written igpm, UK gpm or imp gpm)" },
  { name: "bhp", definition: "1 hp", note: "brake horsepower: shaft power in mechanical horsepower" },
  { name: "cfs", definition: "1 ft^3/s", note: "cubic foot per second" },
  { name: "cfm", definition: "1 ft^3/min", note: "cubic foot per minute" },
  { name: "lps", definition: "1 L/s", note: "litre per second" },
  { name: "lpm", definition: "1 L/min", note: "litre per minute" },
  { name: "poise", definition: "0.1 Pa s", note: "poise, 0.1 Pa·s" },
  { name: "cP", definition: "0.001 Pa s", note: "centipoise, 1 mPa·s" },
  { name: "stokes", definition: "0.0001 m^2/s", note: "stokes, 1 cm²/s" },
  { name: "cSt", definition: "0.000001 m^2/s", note: "centistokes, 1 mm²/s" },
  { name: "rpm", definition: `${1 / 60} Hz`, note: "revolution per minute (rotational speed; Hz is revolutions per second here)" },
];

export type MathUnit = import("mathjs").Unit;

/** Parses "value unit" text with mathjs's unit parser (numbers and unit names only). */
export function parseUnitText(text: string): MathUnit {
  return math().Unit.parse(text);
}

/** A unit with no value, from a unit name such as "gpm" or "m^3/h". */
export function unitOf(name: string): MathUnit {
  const unit = math().unit(name);
  // "-500 degC" parses as a quantity; a unit name must not carry a number of its own.
  if ((unit as MathUnit & { value: number | null }).value !== null) throw new Error(`"${name}" holds a number: expected a unit name alone`);
  return unit;
}

/** Makes a quantity from a number and a unit name. */
export function quantity(value: number, unitName: string): MathUnit {
  return math().unit(value, unitName);
}
