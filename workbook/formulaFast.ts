/**
 * A faster front end for the formula library: its own tokenizer and recursive-descent parser
 * for the common run of formulas (numbers, strings, TRUE/FALSE, cell and range references with
 * or without a sheet, the arithmetic, text and comparison operators, %, unary signs, brackets,
 * function calls), built to the library's grammar rule for rule, and then the library's own
 * evaluation steps (its infix, prefix and postfix operators, range building, function calls and
 * result check) in the library's order. So a formula gives exactly what the library gives
 * (test/formulaFast.test.ts compares the two on thousands of random formulas), at a small
 * fraction of the library's parsing cost.
 *
 * Anything else (defined names, intersections, unions, array constants, error literals, @,
 * structured references, text the library would not accept) returns undefined, and the caller
 * hands the formula to the library itself. Only workbook/formula.ts uses this module: it
 * passes the library's parser in.
 */

/** The token kinds the library's lexer gives, for the part of its vocabulary handled here. */
type TokenType = "String" | "SheetQuoted" | "Function" | "Sheet" | "Cell" | "Boolean" | "Column" | "Number" | "Comma" | "Colon" | "OpenParen" | "CloseParen" | "Op" | "Percent";

export interface FastToken {
  type: TokenType;
  image: string;
}

// The library's token patterns (fast-formula-parser grammar/lexing.js), tried in its order.
const STRING = /"(?:""|[^"])*"/y;
const SHEET_QUOTED = /'(?:(?![\\/[\]*?:]).)+?'!/y;
const FUNCTION = /[A-Za-z_]+[A-Za-z_0-9.]*\(/y;
const SHEET = /[A-Za-z_.\d\u007F-\uFFFF]+!/y;
const CELL = /[$]?[A-Za-z]{1,3}[$]?[1-9][0-9]*/y;
const BOOLEAN = /TRUE|FALSE/iy;
const COLUMN = /[$]?[A-Za-z]{1,3}/y;
const NAME = /[a-zA-Z_][a-zA-Z0-9_.?]*/y;
const NUMBER = /[0-9]+[.]?[0-9]*(?:[eE][+-][0-9]+)?/y;
const SPACE = /\s+/y;

/** Length of the pattern's match at `at` (0 for none), without making a match array. */
function lengthAt(re: RegExp, text: string, at: number): number {
  re.lastIndex = at;
  return re.test(text) ? re.lastIndex - at : 0;
}

function matchAt(re: RegExp, text: string, at: number): string | undefined {
  const n = lengthAt(re, text, at);
  return n ? text.slice(at, at + n) : undefined;
}

/**
 * The formula's tokens as the library's lexer would give them, or undefined when it holds a
 * token this front end leaves to the library (a name, an error literal, @, [ ], { }, ;, a
 * single-quoted string that is not a sheet name).
 */
export function tokenize(text: string): FastToken[] | undefined {
  const out: FastToken[] = [];
  let at = 0;
  while (at < text.length) {
    const ch = text[at];
    const code = text.charCodeAt(at);
    let type: TokenType | undefined;
    let image: string | undefined;
    // Each first character can only start some of the library's tokens: try those, in its order.
    const space = code <= 32 || code >= 0x7f ? matchAt(SPACE, text, at) : undefined;
    if (space) {
      at += space.length;
      continue;
    }
    if (ch === '"') {
      if (!(image = matchAt(STRING, text, at))) return undefined;
      type = "String";
    } else if (ch === "'") {
      if (!(image = matchAt(SHEET_QUOTED, text, at))) return undefined;
      type = "SheetQuoted";
    } else if (code >= 48 && code <= 57) {
      if ((image = matchAt(SHEET, text, at))) type = "Sheet";
      else if ((image = matchAt(NUMBER, text, at))) type = "Number";
      else return undefined;
    } else if ((code >= 65 && code <= 90) || (code >= 97 && code <= 122) || ch === "_" || ch === "$" || ch === "." || code >= 0x7f) {
      if ((image = matchAt(FUNCTION, text, at))) type = "Function";
      else if ((image = matchAt(SHEET, text, at))) type = "Sheet";
      else if ((image = matchAt(CELL, text, at))) {
        // The library's Cell and Column tokens give way to a longer Name (its longer_alt).
        if (lengthAt(NAME, text, at) > image.length) return undefined;
        type = "Cell";
      } else if ((image = matchAt(BOOLEAN, text, at))) type = "Boolean";
      else if ((image = matchAt(COLUMN, text, at))) {
        if (lengthAt(NAME, text, at) > image.length) return undefined;
        type = "Column";
      } else return undefined;
    } else if (ch === ",") [type, image] = ["Comma", ch];
    else if (ch === ":") [type, image] = ["Colon", ch];
    else if (ch === "(") [type, image] = ["OpenParen", ch];
    else if (ch === ")") [type, image] = ["CloseParen", ch];
    else if (ch === "%") [type, image] = ["Percent", ch];
    else if (ch === "*" || ch === "+" || ch === "/" || ch === "-" || ch === "&" || ch === "^" || ch === "=") [type, image] = ["Op", ch];
    else if (ch === "<" || ch === ">") {
      const two = text.slice(at, at + 2);
      image = two === "<>" || two === ">=" || two === "<=" ? two : ch;
      type = "Op";
    } else return undefined; // #errors, @, [ ], { }, ; and anything else
    out.push({ type, image });
    at += image.length;
  }
  return out;
}

/** What the library's parser object offers the evaluation (fast-formula-parser grammar/hooks.js and utils.js). */
export interface LibraryParser {
  position: unknown;
  async: boolean;
  utils: {
    parseCellAddress(address: string): unknown;
    parseCol(column: string): unknown;
    applyRange(refs: unknown[]): unknown;
    applyPrefix(prefixes: string[], value: unknown): unknown;
    applyPostfix(value: unknown, postfix: string): unknown;
    applyInfix(a: unknown, op: string, b: unknown): unknown;
    toNumber(image: string): unknown;
    toString(image: string): unknown;
    toBoolean(image: string): unknown;
    isFormulaError(v: unknown): boolean;
  };
  callFunction(name: string, args: unknown[]): unknown;
  checkFormulaResult(result: unknown, allowReturnArray: boolean): unknown;
}

/** A parsed formula: evaluating it calls the library's steps in the order its parser would. */
export type Compiled = (p: LibraryParser) => unknown;

/** A Cell token's parts, as the library's parseCellAddress reads them (grammar/utils.js). */
export function cellAddress(image: string): { address: string; row: number; col: number } {
  let i = image[0] === "$" ? 1 : 0;
  let col = 0;
  for (; i < image.length; i++) {
    const c = image.charCodeAt(i) | 32; // lower case
    if (c < 97 || c > 122) break;
    col = col * 26 + (c - 96);
  }
  if (image[i] === "$") i++;
  return { address: image, row: Number(image.slice(i)), col };
}

/** The library's binary operators by precedence, highest first (grammar/parsing.js). */
const PRECEDENCE = [["^"], ["*", "/"], ["+", "-"], ["&"], ["<", ">", "=", "<>", "<=", ">="]];

class Unsupported extends Error {}

const OPERAND_START = new Set<TokenType>(["String", "SheetQuoted", "Function", "Sheet", "Cell", "Boolean", "Column", "Number", "OpenParen"]);

/** Parses the tokens by the library's grammar; throws Unsupported for what it leaves to the library. */
class Parser {
  private at = 0;
  constructor(private readonly tokens: FastToken[]) {}

  private peek(): FastToken | undefined {
    return this.tokens[this.at];
  }

  private take(type: TokenType): FastToken {
    const t = this.tokens[this.at];
    if (!t || t.type !== type) throw new Unsupported();
    this.at++;
    return t;
  }

  whole(): Compiled {
    const c = this.binary();
    if (this.at !== this.tokens.length) throw new Unsupported();
    return c;
  }

  // formulaWithBinaryOp: operands left to right, then each precedence level left to right.
  private binary(): Compiled {
    const values = [this.percent()];
    const ops: string[] = [];
    for (let t = this.peek(); t && t.type === "Op"; t = this.peek()) {
      this.at++;
      ops.push(t.image);
      values.push(this.percent());
    }
    if (!ops.length) return values[0];
    if (ops.length === 1) {
      const [a, b] = values;
      const op = ops[0];
      return (p) => {
        const left = a(p);
        return p.utils.applyInfix(left, op, b(p));
      };
    }
    // The library evaluates every operand left to right, then applies the operators level by
    // level, each level left to right, folding its list as it goes: that order is fixed by the
    // text, so it is worked out here once (step = index folded, operator).
    const steps: [number, string][] = [];
    const pending = [...ops];
    for (const level of PRECEDENCE) {
      for (let i = 0; i < pending.length; i++) {
        if (!level.includes(pending[i])) continue;
        steps.push([i, pending[i]]);
        pending.splice(i, 1);
        i--;
      }
    }
    return (p) => {
      const vs = values.map((v) => v(p));
      for (const [i, op] of steps) vs.splice(i, 2, p.utils.applyInfix(vs[i], op, vs[i + 1]));
      return vs[0];
    };
  }

  // formulaWithPercentOp: one % at most.
  private percent(): Compiled {
    const value = this.unary();
    if (this.peek()?.type !== "Percent") return value;
    this.at++;
    if (this.peek()?.type === "Percent") throw new Unsupported();
    return (p) => p.utils.applyPostfix(value(p), "%");
  }

  // formulaWithUnaryOp: any run of + and - signs.
  private unary(): Compiled {
    const prefixes: string[] = [];
    for (let t = this.peek(); t && t.type === "Op" && (t.image === "+" || t.image === "-"); t = this.peek()) {
      prefixes.push(t.image);
      this.at++;
    }
    const value = this.range();
    // formulaWithIntersect: an operand right after another is an intersection (A1:B5 B2:C3) or
    // an error; both are left to the library.
    const next = this.peek();
    if (next && OPERAND_START.has(next.type)) throw new Unsupported();
    if (!prefixes.length) return value;
    return (p) => p.utils.applyPrefix(prefixes, value(p));
  }

  // formulaWithRange: A1:B2, A:A, 1:3.
  private range(): Compiled {
    const first = this.formula();
    if (this.peek()?.type !== "Colon") return first;
    const refs = [first];
    while (this.peek()?.type === "Colon") {
      this.at++;
      const t = this.peek();
      if (t && (t.type === "Sheet" || t.type === "SheetQuoted")) throw new Unsupported();
      refs.push(this.formula());
    }
    return (p) => p.utils.applyRange(refs.map((r) => r(p)));
  }

  private formula(): Compiled {
    const t = this.peek();
    if (!t) throw new Unsupported();
    switch (t.type) {
      case "Cell": {
        this.at++;
        // What the library's parseCellAddress gives, worked out once: a new object each time,
        // as the library fills in the sheet on the reference it is given.
        const { address, row, col } = cellAddress(t.image);
        return () => ({ ref: { address, col, row } });
      }
      case "Column": {
        this.at++;
        return (p) => p.utils.parseCol(t.image);
      }
      case "Sheet":
      case "SheetQuoted": {
        this.at++;
        const sheet = t.type === "Sheet" ? t.image.slice(0, -1) : t.image.slice(1, -2).replace(/''/g, "'");
        const item = this.range();
        return (p) => {
          const ref = item(p) as { ref?: { sheet?: string } };
          if (!p.utils.isFormulaError(ref)) ref.ref!.sheet = sheet;
          return ref;
        };
      }
      case "OpenParen": {
        this.at++;
        const inner = this.binary();
        this.take("CloseParen");
        return inner;
      }
      case "Number":
        this.at++;
        return (p) => p.utils.toNumber(t.image);
      case "String":
        this.at++;
        return (p) => p.utils.toString(t.image);
      case "Boolean":
        this.at++;
        return (p) => p.utils.toBoolean(t.image);
      case "Function": {
        this.at++;
        const name = t.image.slice(0, -1);
        if (this.peek()?.type === "Comma") throw new Unsupported();
        const args: (Compiled | null)[] = [];
        if (this.peek()?.type !== "CloseParen") {
          args.push(this.binary());
          while (this.peek()?.type === "Comma") {
            this.at++;
            const next = this.peek();
            args.push(next && next.type !== "Comma" && next.type !== "CloseParen" ? this.binary() : null);
          }
        }
        this.take("CloseParen");
        return (p) => p.callFunction(name, args.map((a) => (a ? a(p) : null)));
      }
      default:
        throw new Unsupported();
    }
  }
}

/** The formula (as its tokens) parsed for evaluation, or undefined when it is left to the library. */
export function compile(tokens: FastToken[] | undefined): Compiled | undefined {
  if (!tokens?.length) return undefined;
  try {
    return new Parser(tokens).whole();
  } catch (e) {
    if (e instanceof Unsupported) return undefined;
    throw e;
  }
}
