/**
 * The one generic wrapper between Excel and the catalogue: look up the spec, evaluate, and
 * turn any failure into a worksheet error (#VALUE! or #NUM!) whose message names the argument.
 * Runs inside Excel's custom-functions runtime, where `CustomFunctions` is a global.
 */
import { CalcError } from "../calc/_lib/result";
import { CATALOG_BY_ID } from "../catalog";
import type { Cell } from "../catalog/types";
import { evaluate, type RawArg } from "./evaluate";

/** Excel shows at most about 255 characters of an error message. */
const MAX_MESSAGE = 250;

function worksheetError(kind: "num" | "value", message: string): CustomFunctions.Error {
  const text = message.length > MAX_MESSAGE ? `${message.slice(0, MAX_MESSAGE - 1)}…` : message;
  return new CustomFunctions.Error(kind === "num" ? CustomFunctions.ErrorCode.invalidNumber : CustomFunctions.ErrorCode.invalidValue, text);
}

/** Evaluates worksheet function `id` on Excel's raw arguments; throws a CustomFunctions.Error on failure. */
function runWorksheetFunction(id: string, rawArgs: RawArg[]): number | Cell[][] {
  const spec = CATALOG_BY_ID.get(id);
  if (!spec) throw worksheetError("value", `NAPPE.${id} is not in this version of the add-in`);
  try {
    return evaluate(spec, rawArgs).value;
  } catch (e) {
    if (e instanceof CalcError) throw worksheetError(e.kind, e.message);
    throw worksheetError("value", `NAPPE.${id} failed unexpectedly: ${e instanceof Error ? e.message : String(e)}`);
  }
}

/** A function with a single result: its number. */
export function runScalar(id: string, rawArgs: RawArg[]): number {
  const value = runWorksheetFunction(id, rawArgs);
  if (typeof value !== "number") throw worksheetError("value", `NAPPE.${id} gave a table where one number was expected`);
  return value;
}

/** A function whose result spills: its rows. */
export function runSpill(id: string, rawArgs: RawArg[]): Cell[][] {
  const value = runWorksheetFunction(id, rawArgs);
  if (typeof value === "number") throw worksheetError("value", `NAPPE.${id} gave one number where a table was expected`);
  return value;
}
