/**
 * The formula library's evaluation steps for the fast front end (workbook/formulaFast.ts), run
 * without building the library's parser: the parser brings Chevrotain and its grammar, which
 * cost the command more at every start than a large workbook's formulas take to parse.
 *
 * Adapted from fast-formula-parser 1.0.19 (MIT): the synchronous paths of its parser object
 * (grammar/hooks.js: getCell, getRange, retrieveRef, callFunction, checkFormulaResult, and the
 * function lists its constructor makes) and of its Utils (grammar/utils.js: the prefix, postfix,
 * infix and range steps, extractRefValue, the literals), in the library's order, with its own
 * operators, helpers and function library (workbook/formulaSteps.ts). Functions are found by
 * the names workbook/formulaFunctions.ts lists, so that a group can load when first used.
 * test/formulaFast.test.ts compares values, errors with their messages, and the cells read, with
 * the library itself.
 */
import { FormulaError } from "./formula";
import type { LibraryParser } from "./formulaFast";
import type { FunctionGroup } from "./formulaFunctions";
import type { LibrarySteps } from "./formulaSteps";

type Fn = (...args: unknown[]) => unknown;
type LibraryUtils = LibraryParser["utils"];
type Ref = { sheet?: string; row?: number; col?: number; from?: { row: number; col: number }; to?: { row: number; col: number } };

const MAX_ROW = 1048576;
const MAX_COLUMN = 16384;
/** Functions given the evaluator and their arguments as written (hooks.js funsNeedContextAndNoDataRetrieve). */
const CONTEXT_NO_RETRIEVE = new Set(["ROW", "ROWS", "COLUMN", "COLUMNS", "SUMIF", "INDEX", "AVERAGEIF", "IF"]);
/** Functions given the evaluator first (hooks.js funsNeedContext). */
const CONTEXT = new Set([...CONTEXT_NO_RETRIEVE, "OFFSET", "INDIRECT", "CHOOSE", "WEBSERVICE"]);

interface EvaluatorConfig {
  functions: Record<string, (...args: never[]) => unknown>;
  keepReferences: readonly string[];
  onCell: (ref: never) => unknown;
  onRange: (ref: never) => unknown[][];
}

export class Evaluator implements LibraryParser {
  position = { sheet: "", row: 0, col: 0 };
  async = false;
  readonly utils: Steps;
  /** The group whose function a name calls: groups merge in the library's order, a later one winning. */
  private readonly groupOf: Map<string, FunctionGroup>;
  /** Functions for which a left-out argument is 0; for the others it is "" (hooks.js funsNullAs0). */
  private readonly nullAs0: Set<string>;
  /** Functions whose arguments keep the reference they were written as. */
  private readonly keepRef: Set<string>;

  constructor(
    private readonly steps: LibrarySteps,
    private readonly config: EvaluatorConfig,
  ) {
    const g = steps.names;
    this.groupOf = new Map((Object.keys(g) as FunctionGroup[]).flatMap((group) => g[group].map((name) => [name, group] as const)));
    this.nullAs0 = new Set<string>([...g.math, ...g.trigonometry, ...g.logical, ...g.engineering, ...g.reference, ...g.statistical, ...g.date]);
    this.keepRef = new Set([...g.information, ...config.keepReferences.map((n) => n.toUpperCase())]);
    this.utils = new Steps(this, steps);
  }

  /** The function a name calls: ours first (merged last by the library), then the library's group that has it. */
  private functionNamed(name: string): Fn | undefined {
    if (Object.prototype.hasOwnProperty.call(this.config.functions, name)) return this.config.functions[name] as Fn;
    const group = this.groupOf.get(name);
    return group ? (this.steps.group(group)[name] as Fn | undefined) : undefined;
  }

  retrieveRef(valueOrRef: unknown): unknown {
    const h = this.steps.FormulaHelpers;
    if (h.isRangeRef(valueOrRef)) return this.getRange((valueOrRef as { ref: Ref }).ref);
    if (h.isCellRef(valueOrRef)) return this.getCell((valueOrRef as { ref: Ref }).ref);
    return valueOrRef;
  }

  private getCell(ref: Ref): unknown {
    if (ref.sheet == null) ref.sheet = this.position ? this.position.sheet : undefined;
    return this.config.onCell(ref as never);
  }

  private getRange(ref: Ref): unknown {
    if (ref.sheet == null) ref.sheet = this.position ? this.position.sheet : undefined;
    return this.config.onRange(ref as never);
  }

  callFunction(name: string, args: unknown[]): unknown {
    return this.steps.FormulaHelpers.checkFunctionResult(this.call(name, args));
  }

  /** What a written function name calls, and how, worked out once per name. */
  private readonly named = new Map<string, { name: string; nullValue: 0 | ""; retrieve: boolean; keep: boolean; context: boolean; fn?: Fn }>();

  private call(written: string, args: unknown[]): unknown {
    let how = this.named.get(written);
    if (!how) {
      let name = written;
      if (name.indexOf("_xlfn.") === 0) name = name.slice(6);
      name = name.toUpperCase();
      how = { name, nullValue: this.nullAs0.has(name) ? 0 : "", retrieve: !CONTEXT_NO_RETRIEVE.has(name), keep: this.keepRef.has(name), context: CONTEXT.has(name) };
      this.named.set(written, how);
    }
    const { name, nullValue, keep } = how;
    if (how.retrieve) {
      const h = this.steps.FormulaHelpers;
      args = args.map((arg) => {
        if (arg === null) return { value: nullValue, isArray: false, omitted: true };
        // extractRefValue, without its pair object.
        const isArray = Array.isArray(arg);
        const value = (arg as { ref?: unknown }).ref ? this.retrieveRef(arg) : arg;
        if (keep) return { value, isArray, ref: (arg as { ref?: Ref }).ref };
        return { value, isArray, isRangeRef: !!h.isRangeRef(arg), isCellRef: !!h.isCellRef(arg) };
      });
    }
    const fn = (how.fn ??= this.functionNamed(name));
    if (!fn) throw FormulaError.NOT_IMPLEMENTED(name);
    let res: unknown;
    try {
      res = how.context ? fn(this, ...args) : fn(...args);
    } catch (e) {
      // The library lets functions throw its error as their result.
      if (e instanceof FormulaError) return e;
      throw e;
    }
    if (res === undefined) throw FormulaError.NOT_IMPLEMENTED(name);
    return res;
  }

  checkFormulaResult(result: unknown, allowReturnArray = false): unknown {
    if (typeof result === "number") {
      if (isNaN(result)) return new FormulaError("#VALUE!");
      if (!isFinite(result)) return new FormulaError("#NUM!");
      return result + 0; // -0 as 0
    }
    // As the library: null is an object here, and reading its .ref below throws (a #ERROR! to the caller).
    if (typeof result !== "object") return result;
    if (result instanceof FormulaError) return result;
    if (allowReturnArray) {
      if ((result as { ref?: Ref }).ref) result = this.retrieveRef(result);
      // A union or anything else that is neither a value nor an array.
      if (typeof result === "object" && !Array.isArray(result) && result != null) return new FormulaError("#VALUE!");
      return result;
    }
    const ref = (result as { ref?: Ref }).ref;
    if (ref && ref.row && !ref.from) return this.retrieveRef(result);
    if (ref && ref.from && ref.from.col === ref.to!.col) return this.retrieveRef({ ref: { row: ref.from.row, col: ref.from.col } });
    if (Array.isArray(result)) return (result as unknown[][])[0][0];
    return new FormulaError("#VALUE!");
  }
}

/** The library's Utils steps the fast front end calls. */
class Steps implements LibraryUtils {
  constructor(
    private readonly context: Evaluator,
    private readonly steps: LibrarySteps,
  ) {}

  extractRefValue(obj: unknown): { val: unknown; isArray: boolean } {
    const isArray = Array.isArray(obj);
    if ((obj as { ref?: unknown }).ref) return { val: this.context.retrieveRef(obj), isArray };
    return { val: obj, isArray };
  }

  isFormulaError(obj: unknown): boolean {
    return obj instanceof FormulaError;
  }

  parseCol(column: string): { ref: Ref } {
    return { ref: { col: this.steps.Address.columnNameToNumber(column), row: undefined } };
  }

  private parseRow(row: unknown): { ref: Ref } {
    const n = Number(row);
    if (!Number.isInteger(n)) throw Error("Row number must be integer.");
    return { ref: { col: undefined, row: n } };
  }

  /** extractRefValue's value alone (its isArray is Array.isArray of the operand as given). */
  private valueOf(obj: unknown): unknown {
    return (obj as { ref?: unknown }).ref ? this.context.retrieveRef(obj) : obj;
  }

  applyPrefix(prefixes: string[], value: unknown): unknown {
    const val = this.valueOf(value);
    if (this.isFormulaError(val)) return val;
    return this.steps.Prefix.unaryOp(prefixes, val, Array.isArray(value));
  }

  applyPostfix(value: unknown, postfix: string): unknown {
    const val = this.valueOf(value);
    if (this.isFormulaError(val)) return val;
    return this.steps.Postfix.percentOp(val, postfix, Array.isArray(value));
  }

  applyInfix(value1: unknown, infix: string, value2: unknown): unknown {
    const a = this.valueOf(value1);
    const b = this.valueOf(value2);
    if (this.isFormulaError(a)) return a;
    if (this.isFormulaError(b)) return b;
    const { Infix, Operators } = this.steps;
    const aIsArray = Array.isArray(value1);
    const bIsArray = Array.isArray(value2);
    if (Operators.compareOp.includes(infix)) return Infix.compareOp(a, infix, b, aIsArray, bIsArray);
    if (Operators.concatOp.includes(infix)) return Infix.concatOp(a, infix, b, aIsArray, bIsArray);
    if (Operators.mathOp.includes(infix)) return Infix.mathOp(a, infix, b, aIsArray, bIsArray);
    throw new Error(`Unrecognized infix: ${infix}`);
  }

  applyRange(refs: unknown[]): unknown {
    let maxRow = -1;
    let maxCol = -1;
    let minRow = MAX_ROW + 1;
    let minCol = MAX_COLUMN + 1;
    for (let item of refs) {
      if (this.isFormulaError(item)) continue;
      if (typeof item === "number") item = this.parseRow(item);
      const ref = (item as { ref: Ref }).ref;
      if (ref.row === undefined) {
        minRow = 1;
        maxRow = MAX_ROW;
      }
      if (ref.col === undefined) {
        minCol = 1;
        maxCol = MAX_COLUMN;
      }
      // As the library compares: undefined against a number is false either way.
      if ((ref.row as number) > maxRow) maxRow = ref.row!;
      if ((ref.row as number) < minRow) minRow = ref.row!;
      if ((ref.col as number) > maxCol) maxCol = ref.col!;
      if ((ref.col as number) < minCol) minCol = ref.col!;
    }
    if (maxRow === minRow && maxCol === minCol) return { ref: { row: maxRow, col: maxCol } };
    return { ref: { from: { row: minRow, col: minCol }, to: { row: maxRow, col: maxCol } } };
  }

  toNumber(image: string): number {
    return Number(image);
  }

  toString(image: string): string {
    return image.substring(1, image.length - 1).replace(/""/g, '"');
  }

  toBoolean(image: string): boolean {
    return image === "TRUE";
  }
}
