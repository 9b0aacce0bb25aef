/**
 * The formula library's parser and lexer, for workbook/formula.ts. Here they are imported as
 * usual (the command, the tests, the preview server). The pane's build swaps this module for
 * taskpane/formulaLibraryLazy.ts, which loads them as a chunk of their own the first time a
 * formula is analysed, so that the pane's first script stays small.
 */
import FormulaParser from "fast-formula-parser";
import { lex } from "fast-formula-parser/grammar/lexing";
import { STEPS } from "./formulaGroups";

const LIBRARY = { FormulaParser, lex, steps: STEPS };
export type FormulaLibrary = typeof LIBRARY;

/** Resolves once the library can be used (at once here). */
export async function formulaLibraryReady(): Promise<void> {}

/** The library; in the pane's build, only after formulaLibraryReady() has resolved. */
export function formulaLibrary(): FormulaLibrary {
  return LIBRARY;
}
