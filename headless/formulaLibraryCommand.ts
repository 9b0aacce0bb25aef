/**
 * The command's build of workbook/formulaLibrary.ts (webpack.config.js swaps it in). The
 * library's operators load with the command; each group of its functions loads when one of them
 * is first called (statistics and engineering bring large libraries of their own); its parser
 * and lexer (Chevrotain and the grammar, most of the command's start-up) only when first needed:
 * a formula the fast front end leaves to the library, a call-site or dependency analysis. A
 * plain recalculation of ordinary formulas never loads them.
 */
import type { FormulaLibrary } from "../workbook/formulaLibrary";
import type { FunctionGroup } from "../workbook/formulaFunctions";
import { librarySteps, type LibraryFunctions } from "../workbook/formulaSteps";

/** One group of the library's functions, loaded when first asked for (require() calls of fixed names, which webpack leaves to Node). */
function group(name: FunctionGroup): LibraryFunctions {
  switch (name) {
    case "date":
      return require("fast-formula-parser/formulas/functions/date") as LibraryFunctions;
    case "engineering":
      return require("fast-formula-parser/formulas/functions/engineering") as LibraryFunctions;
    case "information":
      return require("fast-formula-parser/formulas/functions/information") as LibraryFunctions;
    case "logical":
      return require("fast-formula-parser/formulas/functions/logical") as LibraryFunctions;
    case "math":
      return require("fast-formula-parser/formulas/functions/math") as LibraryFunctions;
    case "reference":
      return require("fast-formula-parser/formulas/functions/reference") as LibraryFunctions;
    case "statistical":
      return require("fast-formula-parser/formulas/functions/statistical") as LibraryFunctions;
    case "text":
      return require("fast-formula-parser/formulas/functions/text") as LibraryFunctions;
    case "trigonometry":
      return require("fast-formula-parser/formulas/functions/trigonometry") as LibraryFunctions;
    case "web":
      return require("fast-formula-parser/formulas/functions/web") as LibraryFunctions;
  }
}

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
  steps: librarySteps(group),
};

/** Resolves once the library can be used (at once here). */
export async function formulaLibraryReady(): Promise<void> {}

/** The library: its parser and lexer load on first use. */
export function formulaLibrary(): FormulaLibrary {
  return LIBRARY;
}
