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

/** Each group of the library's functions, loaded when first asked for (require() calls of fixed names, which webpack leaves to Node). */
const GROUPS: Record<FunctionGroup, () => unknown> = {
  date: () => require("fast-formula-parser/formulas/functions/date"),
  engineering: () => require("fast-formula-parser/formulas/functions/engineering"),
  information: () => require("fast-formula-parser/formulas/functions/information"),
  logical: () => require("fast-formula-parser/formulas/functions/logical"),
  math: () => require("fast-formula-parser/formulas/functions/math"),
  reference: () => require("fast-formula-parser/formulas/functions/reference"),
  statistical: () => require("fast-formula-parser/formulas/functions/statistical"),
  text: () => require("fast-formula-parser/formulas/functions/text"),
  trigonometry: () => require("fast-formula-parser/formulas/functions/trigonometry"),
  web: () => require("fast-formula-parser/formulas/functions/web"),
};

function group(name: FunctionGroup): LibraryFunctions {
  return GROUPS[name]() as LibraryFunctions;
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
