/**
 * The pane's build of workbook/formulaLibrary.ts (webpack.config.js swaps it in): the formula
 * library (its parser, Chevrotain, its evaluation steps and functions) is a chunk of its own,
 * formula.chunk.js with the vendor chunk it loads, fetched the first time a formula is analysed. Every pane entry point that analyses formulas
 * awaits formulaLibraryReady() first (explainCell, checkWorkbook, the preview's in-memory host).
 */
import type { FormulaLibrary } from "../workbook/formulaLibrary";

let library: FormulaLibrary | undefined;
let loading: Promise<void> | undefined;

export function formulaLibraryReady(): Promise<void> {
  loading ??= Promise.all([
    import(/* webpackChunkName: "formula" */ "fast-formula-parser"),
    import(/* webpackChunkName: "formula" */ "fast-formula-parser/grammar/lexing"),
    import(/* webpackChunkName: "formula" */ "../workbook/formulaGroups"),
  ]).then(([parser, lexing, steps]) => {
    library = { FormulaParser: parser.default, lex: lexing.lex, steps: steps.STEPS };
  });
  return loading;
}

export function formulaLibrary(): FormulaLibrary {
  if (!library) throw new Error("the formula library is still loading: wait for formulaLibraryReady()");
  return library;
}
