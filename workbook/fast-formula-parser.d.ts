// Minimal typings for the parts of fast-formula-parser (MIT) this project uses.
declare module "fast-formula-parser" {
  export interface CellRef {
    sheet: string;
    row: number;
    col: number;
  }
  export interface RangeRef {
    sheet: string;
    from: { row: number; col: number };
    to: { row: number; col: number };
  }
  export interface FunctionArg {
    value: unknown;
    isArray?: boolean;
    omitted?: boolean;
    ref?: Partial<CellRef & RangeRef>;
  }
  export class FormulaError extends Error {
    constructor(error: string, msg?: string, details?: unknown);
    readonly error: string;
    readonly details: unknown;
    static NOT_IMPLEMENTED(name: string): FormulaError;
    /** What the library throws for a formula it failed to evaluate: #ERROR! with the message and the cause. */
    static ERROR(msg: string, details?: unknown): FormulaError;
  }
  export default class FormulaParser {
    constructor(config: {
      onCell?: (ref: CellRef) => unknown;
      onRange?: (ref: RangeRef) => unknown[][];
      functions?: Record<string, (...args: FunctionArg[]) => unknown>;
    });
    /** Internal list of functions whose arguments keep their references (used to see what an argument refers to). */
    funsPreserveRef: string[];
    parse(formula: string, position: { sheet: string; row: number; col: number }, allowReturnArray?: boolean): unknown;
    static FormulaError: typeof FormulaError;
    static MAX_ROW: number;
    static MAX_COLUMN: number;
  }
}

declare module "fast-formula-parser/grammar/lexing" {
  export interface Token {
    image: string;
    startOffset: number;
    endOffset: number;
    tokenType: { name: string };
  }
  export function lex(text: string): { tokens: Token[]; errors: unknown[] };
}

declare module "fast-formula-parser/formulas/error" {
  import { FormulaError } from "fast-formula-parser";
  export default FormulaError;
}

// The library's evaluation modules, which load without its parser (workbook/formulaSteps.ts).
// CommonJS modules: imported whole (Node's ESM loader cannot see all their named exports).
declare module "fast-formula-parser/formulas/helpers" {
  const helpers: {
    FormulaHelpers: {
      isRangeRef(value: unknown): unknown;
      isCellRef(value: unknown): unknown;
      checkFunctionResult(result: unknown): unknown;
    };
    Address: { columnNameToNumber(name: string): number };
  };
  export default helpers;
}

declare module "fast-formula-parser/formulas/operators" {
  type Binary = (a: unknown, op: string, b: unknown, aIsArray: boolean, bIsArray: boolean) => unknown;
  const operators: {
    Prefix: { unaryOp(prefixes: string[], value: unknown, isArray: boolean): unknown };
    Postfix: { percentOp(value: unknown, postfix: string, isArray: boolean): unknown };
    Infix: { compareOp: Binary; concatOp: Binary; mathOp: Binary };
    Operators: { compareOp: string[]; concatOp: string[]; mathOp: string[] };
  };
  export default operators;
}

declare module "fast-formula-parser/formulas/functions/*" {
  const functions: Record<string, (...args: never[]) => unknown>;
  export default functions;
}
