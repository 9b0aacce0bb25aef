/**
 * The shape of a worksheet function's spec. One spec per function drives the worksheet
 * binding, the pane's explanation, the README reference and the checks.
 */
import type { CalcResult } from "../calc/_lib/result";
import type { Table, TableKind } from "../tables/table";
import type { Dimension } from "../units/dimensions";

/** Argument values after coercion, by parameter name: numbers in base units, choices as lower-case text, tables. */
export type Args = Readonly<Record<string, number | string | Table | undefined>>;

/** One cell of a spilled result. */
export type Cell = number | string;

interface ParamBase {
  /** Name as the worksheet shows it (snake_case). */
  name: string;
  /** One line for the worksheet tooltip and the docs. */
  description: string;
  optional?: boolean;
}

/** A physical quantity: bare number in the dimension's base unit, or text with a unit. */
export interface QuantityParam extends ParamBase {
  kind: "quantity";
  dim: Dimension;
  /** Value used when the argument is left out, in base units, or computed from the other arguments. */
  default?: number | ((args: Args) => number);
  /** Says where the default comes from, for people. */
  defaultNote?: string;
  /** Base-unit magnitudes outside which a bare number is implausible (overrides the dimension's). */
  plausible?: readonly [number, number];
}

/** One of a fixed set of words, compared without regard to case. */
export interface ChoiceParam extends ParamBase {
  kind: "choice";
  options: readonly string[];
  default?: string;
  defaultNote?: string;
}

/** A unit name: the result's unit (`unit`), or the units of CONVERT. */
export interface UnitParam extends ParamBase {
  kind: "unit";
}

/** A name looked up in a table (pipe size, schedule, material, fitting): text, or a number read as text. */
interface TextParam extends ParamBase {
  kind: "text";
}

/** A quantity whose dimension is set by another argument (AFFINITY's value). */
interface AnyQuantityParam extends ParamBase {
  kind: "anyQuantity";
  /** Picks the dimension from the other (already coerced) arguments. */
  dimFrom: (args: Args) => Dimension;
}

/** A range read as a table with an optional header row of column names and units. */
export interface TableParam extends ParamBase {
  kind: "table";
  table: TableKind;
  /** A single value (or one cell) is read as a quantity of this dimension instead of a table. */
  scalar?: Dimension;
}

export type ParamSpec = QuantityParam | ChoiceParam | UnitParam | TextParam | AnyQuantityParam | TableParam;

/** One argument of an example as a worksheet passes it: a number, text, null when skipped, or a range. */
export type ExampleArg = number | string | null | readonly (readonly (number | string | null)[])[];

/** A worked example that runs as a test through the calc core and the built worksheet binding. */
export interface Example {
  /** Arguments as a worksheet would pass them: numbers, text, null for a skipped optional, ranges. */
  args: readonly ExampleArg[];
  /** Expected worksheet result: a number, or for a spilled result the expected cells. */
  expect: number | readonly (readonly Cell[])[];
  /** Relative tolerance (default 1e-9). */
  tolerance?: number;
  /** Where the expected value comes from. */
  source: string;
}

export interface FunctionSpec {
  /** Worksheet id under NAPPE., upper case, never renamed once published. */
  id: string;
  /** Topic file in functions/calc this function computes with. */
  topic: string;
  /** One line: what it returns. */
  purpose: string;
  params: readonly ParamSpec[];
  /**
   * Dimension of the result, fixed or picked by the arguments. A spilled result (`spill`) is a
   * table whose compute converts its own units; `dim` then describes its main value.
   */
  result: {
    dim: Dimension | ((args: Args) => Dimension);
    description: string;
    spill?: boolean;
    /** For a spill without a header row of its own: the column labels with units, so every view can label it. */
    columns?: (args: Args) => string[];
  };
  /** The equation in LaTeX. */
  equation: string;
  /**
   * The equation again with the numbers of one call put in, as a hand calculation writes it
   * ("h_f = f·(L/D)·V²/2g = 0.0189·(30 m/0.1541 m)·0.0707 m = 0.256 m"), in base units, or in
   * US customary units when the call's flow or a length was given in them.
   */
  derivation?: (n: DerivationNumbers) => string;
  assumptions: readonly string[];
  /** Validity checks the calc function makes, described for people. */
  validity: readonly string[];
  cautions: readonly string[];
  /** Published sources of the method. */
  sources: readonly string[];
  examples: readonly Example[];
  /** Computes the result in base units from coerced arguments. */
  compute: (args: Args) => CalcResult<number | Cell[][]>;
}

/** A number argument read by a default or a dimension rule (which see the untyped arguments). */
export function numberArg(args: Args, name: string): number {
  const v = args[name];
  if (typeof v !== "number") throw new Error(`argument ${name} is not a number here`);
  return v;
}

/**
 * The numbers of one call, formatted for a derivation line with their units: US customary when
 * the call's flow or a length was given in them, else base units.
 */
interface DerivationNumbers {
  /** An argument's value ("30 m"), or in a unit named here ("0.0446 ft^3/s"), to `digits` significant figures where given. */
  arg(name: string, unit?: string, digits?: number): string;
  /** An intermediate value by its symbol ("0.0189"). */
  step(symbol: string): string;
  /** True when the call recorded an intermediate value of that symbol (for lines that depend on the method). */
  has(symbol: string): boolean;
  /** The result ("0.256 m"). */
  result: string;
  /** Standard gravity in the line's units ("9.80665 m/s²" or "32.174 ft/s²"). */
  g: string;
  /** True when the line is in US customary units (for equations with a dimensional constant). */
  us: boolean;
}

/** Resolves a result dimension that may depend on the arguments. */
export function resultDimension(spec: FunctionSpec, args: Args): Dimension {
  return typeof spec.result.dim === "function" ? spec.result.dim(args) : spec.result.dim;
}

/** The value a compute function receives for one parameter (after defaults are filled in). */
type ValueOf<P extends ParamSpec> = P extends { kind: "quantity" | "anyQuantity" }
  ? number
  : P extends { kind: "choice"; options: readonly (infer O extends string)[] }
    ? O
    : P extends { kind: "unit" | "text" }
      ? string
      : P extends { kind: "table"; scalar: Dimension }
        ? Table | number
        : P extends { kind: "table" }
          ? Table
          : never;

/** An optional parameter with no default may be missing. */
type Missing<P extends ParamSpec> = P extends { optional: true } ? (P extends { default: unknown } ? never : undefined) : never;

/** The arguments a compute function receives, typed by the spec's own parameter list. */
type ArgsOf<Ps extends readonly ParamSpec[]> = { readonly [P in Ps[number] as P["name"]]: ValueOf<P> | Missing<P> };

/** A spec as it is written: its compute and result dimension see the arguments typed by its parameters. */
interface TypedSpec<Ps extends readonly ParamSpec[]> extends Omit<FunctionSpec, "params" | "compute" | "result"> {
  params: Ps;
  result: { dim: Dimension | ((args: ArgsOf<Ps>) => Dimension); description: string; spill?: boolean; columns?: (args: ArgsOf<Ps>) => string[] };
  compute: (args: ArgsOf<Ps>) => CalcResult<number | Cell[][]>;
}

/**
 * Declares a worksheet function's spec. The parameter list keeps its literal names and kinds,
 * so compute receives each argument with its own type: a misspelt name or a wrong type fails
 * to compile instead of failing at run time.
 */
export function defineSpec<const Ps extends readonly ParamSpec[]>(spec: TypedSpec<Ps>): FunctionSpec {
  // The one place a typed spec joins the catalogue's list: evaluate() fills the arguments
  // exactly as ArgsOf describes (numbers in base units, lower-case choices, tables, defaults).
  return spec as unknown as FunctionSpec;
}
