/**
 * The function library of our formula engine (workbook/formula/functions), for the evaluator.
 * Here it is imported as usual (the command, the tests, the preview server). The pane's build
 * swaps this module for taskpane/formulaLibraryLazy.ts, which loads it as a chunk of its own the
 * first time a formula is analysed, so that the pane's first script stays small.
 */
import { LIBRARY } from "./formula/functions";
import type { Library } from "./formula/evaluate";

/** Resolves once the library can be used (at once here). */
export async function formulaLibraryReady(): Promise<void> {}

/** The library; in the pane's build, only after formulaLibraryReady() has resolved. */
export function formulaLibrary(): Library {
  return LIBRARY;
}
