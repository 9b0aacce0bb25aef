/**
 * The formula library's evaluation modules (fast-formula-parser's operators and helpers), which
 * load without its parser and Chevrotain, and the shape of what workbook/formulaEvaluator.ts
 * needs from the library. Its function library comes by group (workbook/formulaFunctions.ts
 * lists the names): formulaGroups.ts loads them all at once, the command's build one group when
 * one of its functions is first called (headless/formulaLibraryCommand.ts).
 */
import helpers from "fast-formula-parser/formulas/helpers";
import operators from "fast-formula-parser/formulas/operators";
import { FUNCTION_GROUPS, type FunctionGroup } from "./formulaFunctions";

export type LibraryFunctions = Record<string, (...args: never[]) => unknown>;

const OPERATORS = { FormulaHelpers: helpers.FormulaHelpers, Address: helpers.Address, Infix: operators.Infix, Prefix: operators.Prefix, Postfix: operators.Postfix, Operators: operators.Operators };

export type LibrarySteps = typeof OPERATORS & {
  /** Each group's function names, in the order the library merges the groups. */
  names: typeof FUNCTION_GROUPS;
  /** One group of the library's functions (formulas/functions/<group>.js). */
  group(name: FunctionGroup): LibraryFunctions;
};

/** The evaluation steps, with the library's functions from `group`. */
export function librarySteps(group: (name: FunctionGroup) => LibraryFunctions): LibrarySteps {
  return { ...OPERATORS, names: FUNCTION_GROUPS, group };
}
