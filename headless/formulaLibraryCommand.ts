/**
 * The command's build of workbook/formulaLibrary.ts (webpack.config.js swaps it in). The
 * library's evaluation modules load with the command, but its parser and lexer (Chevrotain and
 * the grammar, most of the command's start-up) only when first needed: a formula the fast front
 * end leaves to the library, a call-site or dependency analysis. A plain recalculation of
 * ordinary formulas never loads them.
 */
import type { FormulaLibrary } from "../workbook/formulaLibrary";
import { STEPS } from "../workbook/formulaSteps";

let parser: FormulaLibrary["FormulaParser"] | undefined;
let lexer: FormulaLibrary["lex"] | undefined;

const LIBRARY: FormulaLibrary = {
  get FormulaParser() {
    // A require() call, which webpack evaluates where it stands (an import would load at start).
    return (parser ??= require("fast-formula-parser") as FormulaLibrary["FormulaParser"]);
  },
  get lex() {
    return (lexer ??= (require("fast-formula-parser/grammar/lexing") as { lex: FormulaLibrary["lex"] }).lex);
  },
  steps: STEPS,
};

/** Resolves once the library can be used (at once here). */
export async function formulaLibraryReady(): Promise<void> {}

/** The library: its parser and lexer load on first use. */
export function formulaLibrary(): FormulaLibrary {
  return LIBRARY;
}
