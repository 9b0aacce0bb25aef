/** The kind of quantity an intermediate value is (as functions/units/dimensions.ts names them). */
export type StepDimension = "length" | "area" | "flow" | "velocity" | "pressure" | "power" | "energy" | "density" | "viscosity" | "kinematicViscosity" | "temperature" | "rotationalSpeed" | "angle" | "modulus" | "time" | "ratio" | "efficiency";

/** A named intermediate value of a calculation, as a hand calculation would write it down. */
export interface Step {
  /** Symbol as engineers write it: "V", "Re", "ε/D", "f", "V²/2g". */
  symbol: string;
  name: string;
  /** In the base unit of its dimension. */
  value: number;
  dim: StepDimension;
  /** How it was obtained: "continuity, V = 4Q/(πD²)", "Colebrook, solved to double precision". */
  how: string;
}

/** What every calc function returns: a value in base units, warnings for the pane, and its intermediate steps. */
export interface CalcResult<T = number> {
  value: T;
  warnings: string[];
  /** The intermediate values a reviewer compares with a hand calculation. */
  steps?: Step[];
}

/** Shorthand for a result (warnings and steps optional). */
export function ok<T>(value: T, warnings: string[] = [], steps?: Step[]): CalcResult<T> {
  return steps ? { value, warnings, steps } : { value, warnings };
}

/** Shorthand for a step. */
export function step(symbol: string, name: string, value: number, dim: StepDimension, how: string): Step {
  return { symbol, name, value, dim, how };
}

/**
 * A calculation that cannot give a meaningful number. `arg` names the argument at fault,
 * `kind` picks the worksheet error: "num" for a value out of range (#NUM!), "value" for a
 * value of the wrong kind (#VALUE!).
 */
export class CalcError extends Error {
  constructor(
    readonly arg: string,
    readonly detail: string,
    readonly kind: "num" | "value" = "num",
  ) {
    super(`${arg}: ${detail}`);
    this.name = "CalcError";
  }
}

/** Throws unless x is a finite number greater than zero. */
export function requirePositive(arg: string, x: number, what = "a value greater than zero"): void {
  if (!(Number.isFinite(x) && x > 0)) throw new CalcError(arg, `expected ${what}; got ${x}`);
}

/** Throws unless x is a finite number of zero or more. */
export function requireNonNegative(arg: string, x: number, what = "a value of zero or more"): void {
  if (!(Number.isFinite(x) && x >= 0)) throw new CalcError(arg, `expected ${what}; got ${x}`);
}

/** Throws unless x is finite. */
export function requireFinite(arg: string, x: number): void {
  if (!Number.isFinite(x)) throw new CalcError(arg, `expected a finite number; got ${x}`);
}


/**
 * A quantity inside a message, written in base units and marked so that the binding layer can
 * rewrite it in the unit the user gave for that kind of quantity ("0.02524 m³/s" becomes
 * "400 gpm" when the flow was given in gpm). Calc code stays in SI; only the words change.
 */
export function quoted(value: number, dim: StepDimension): string {
  return `⟦${dim}:${value}⟧`;
}

/** The base-unit text of marked quantities, for callers that show messages without a binding. */
export function unquote(text: string, write: (value: number, dim: StepDimension) => string): string {
  return text.replace(/⟦([A-Za-z]+):([^⟧]+)⟧/g, (_, dim: string, value: string) => write(Number(value), dim as StepDimension));
}
