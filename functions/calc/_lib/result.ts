/** What every calc function returns: a value in base units plus warnings for the pane. */
export interface CalcResult<T = number> {
  value: T;
  warnings: string[];
}

/** Shorthand for a result with no warnings. */
export function ok<T>(value: T, warnings: string[] = []): CalcResult<T> {
  return { value, warnings };
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

