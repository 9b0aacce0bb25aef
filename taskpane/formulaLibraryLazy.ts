/**
 * The pane's build of workbook/formulaLibrary.ts (webpack.config.js swaps it in): the function
 * library of the formula engine is a chunk of its own, formula.chunk.js, fetched the first time a
 * formula is analysed. Every pane entry point that analyses formulas awaits formulaLibraryReady()
 * first (explainCell, checkWorkbook, the preview's in-memory host).
 */
import type { Library } from "../workbook/formula/evaluate";

let library: Library | undefined;
let loading: Promise<void> | undefined;

export function formulaLibraryReady(): Promise<void> {
  loading ??= import(/* webpackChunkName: "formula" */ "../workbook/formula/functions").then((m) => {
    library = m.LIBRARY;
  });
  return loading;
}

export function formulaLibrary(): Library {
  if (!library) throw new Error("the formula library is still loading: wait for formulaLibraryReady()");
  return library;
}
