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

function isDigit(c: number): boolean {
  return c >= 48 && c <= 57;
}

/** Letters (A-Z, a-z) from `at`. */
function lettersAt(text: string, at: number): number {
  let i = at;
  for (; i < text.length; i++) {
    const c = text.charCodeAt(i) | 32;
    if (c < 97 || c > 122) break;
  }
  return i - at;
}

/**
 * True when a character (NaN past the end) could continue a run of letters and digits into a
 * longer token of the library's: a Sheet name's characters or its "!", a Name's "_", "." or "?",
 * a number's "." or exponent. "(" (a Function) is checked where it matters.
 */
function mayExtend(c: number): boolean {
  if (c !== c) return false;
  return (c >= 48 && c <= 57) || (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || c === 95 || c === 46 || c === 63 || c === 33 || c === 36 || c >= 0x7f;
}

/**
 * Walks the formula's tokens as the library's lexer would find them, calling `emit` with each
 * one's kind and span; false when it holds a token this front end leaves to the library (a
 * name, an error literal, @, [ ], { }, ;, a single-quoted string that is not a sheet name).
 */
function scan(text: string, emit: (type: TokenType, start: number, end: number) => void): boolean {
  let at = 0;
  while (at < text.length) {
    const ch = text[at];
    const code = text.charCodeAt(at);
    let type: TokenType | undefined;
    let n = 0;
    // Each first character can only start some of the library's tokens: try those, in its order.
    if (code <= 32 || code >= 0x7f) {
      const space = lengthAt(SPACE, text, at);
      if (space) {
        at += space;
        continue;
      }
    }
    if (ch === '"') {
      if (!(n = lengthAt(STRING, text, at))) return false;
      type = "String";
    } else if (ch === "'") {
      if (!(n = lengthAt(SHEET_QUOTED, text, at))) return false;
      type = "SheetQuoted";
    } else if (code >= 48 && code <= 57) {
      // The common case first: digits that nothing after them could extend (a Sheet's "!", a
      // decimal point, an exponent, a name character) are a Number, as the patterns below decide.
      let end = at + 1;
      while (end < text.length && isDigit(text.charCodeAt(end))) end++;
      if (!mayExtend(text.charCodeAt(end))) type = "Number";
      if (type) n = end - at;
      else if ((n = lengthAt(SHEET, text, at))) type = "Sheet";
      else if ((n = lengthAt(NUMBER, text, at))) type = "Number";
      else return false;
    } else if ((code >= 65 && code <= 90) || (code >= 97 && code <= 122) || ch === "_" || ch === "$" || ch === "." || code >= 0x7f) {
      // The common case first: one to three letters and a row number with nothing after them that
      // could extend a Function, Sheet or Name, which is the Cell the patterns below would find.
      const letters = lettersAt(text, at);
      if (letters >= 1 && letters <= 3 && text.charCodeAt(at + letters) >= 49 && text.charCodeAt(at + letters) <= 57) {
        let end = at + letters + 1;
        while (end < text.length && isDigit(text.charCodeAt(end))) end++;
        if (!mayExtend(text.charCodeAt(end)) && text.charCodeAt(end) !== 40) [type, n] = ["Cell", end - at];
      }
      if (type) {
        // found above
      } else if ((n = lengthAt(FUNCTION, text, at))) type = "Function";
      else if ((n = lengthAt(SHEET, text, at))) type = "Sheet";
      else if ((n = lengthAt(CELL, text, at))) {
        // The library's Cell and Column tokens give way to a longer Name (its longer_alt).
        if (lengthAt(NAME, text, at) > n) return false;
        type = "Cell";
      } else if ((n = lengthAt(BOOLEAN, text, at))) type = "Boolean";
      else if ((n = lengthAt(COLUMN, text, at))) {
        if (lengthAt(NAME, text, at) > n) return false;
        type = "Column";
      } else return false;
    } else if (ch === ",") [type, n] = ["Comma", 1];
    else if (ch === ":") [type, n] = ["Colon", 1];
    else if (ch === "(") [type, n] = ["OpenParen", 1];
    else if (ch === ")") [type, n] = ["CloseParen", 1];
    else if (ch === "%") [type, n] = ["Percent", 1];
    else if (ch === "*" || ch === "+" || ch === "/" || ch === "-" || ch === "&" || ch === "^" || ch === "=") [type, n] = ["Op", 1];
    else if (ch === "<" || ch === ">") {
      const next = text[at + 1];
      n = (ch === "<" && next === ">") || next === "=" ? 2 : 1;
      type = "Op";
    } else return false; // #errors, @, [ ], { }, ; and anything else
    emit(type, at, at + n);
    at += n;
  }
  return true;
}

/** The formula's tokens as the library's lexer would give them, or undefined where scan() gives up. */
export function tokenize(text: string): FastToken[] | undefined {
  const out: FastToken[] = [];
  return scan(text, (type, start, end) => out.push({ type, image: text.slice(start, end) })) ? out : undefined;
}

/** A Cell token's parts: column and row, each with or without $. */
interface CellParts {
  col: number;
  row: number;
  colFixed: boolean;
  rowFixed: boolean;
  /** Written in capitals, as Excel stores references: only these are written relative in a shape. */
  upper: boolean;
}

export function cellParts(text: string, start = 0, end = text.length): CellParts {
  let i = start;
  const colFixed = text[i] === "$";
  if (colFixed) i++;
  let col = 0;
  let upper = true;
  for (; i < end; i++) {
    const c = text.charCodeAt(i);
    if (c >= 97 && c <= 122) upper = false;
    else if (c < 65 || c > 90) break;
    col = col * 26 + ((c | 32) - 96);
  }
  const rowFixed = text[i] === "$";
  if (rowFixed) i++;
  let row = 0;
  for (; i < end; i++) row = row * 10 + (text.charCodeAt(i) - 48);
  return { col, row, colFixed, rowFixed, upper };
}

/** Written relative to the formula's cell in a shape: capitalised, and not fixed in both parts. */
export function relativeInShape(c: CellParts): boolean {
  return c.upper && !(c.colFixed && c.rowFixed);
}

/**
 * The key of a formula's shape at a cell: its text with each capitalised cell reference written
 * relative to that cell (fixed parts as written), so a formula filled down a column gives one key
 * and is parsed once. Two texts with one key differ only in references that point the same way
 * from their cells, which the lexer reads alike (only digits and capitals change, and what
 * follows is the same). Undefined where scan() gives up, or where the text holds the marker.
 */
export function shapeKey(text: string, row: number, col: number): string | undefined {
  return shapeText(text, row, col)?.key;
}

/**
 * A formula's text split for matching its copies (see matchesTemplate): the key, the literal
 * text between the cell references written relative, and those references as read at the cell
 * the text came from.
 */
export interface Template {
  key: string;
  row: number;
  col: number;
  /** Text before each relative reference, then the text after the last (one more than cells). */
  literals: string[];
  cells: CellParts[];
}

/** The formula's shapeKey with what matchesTemplate needs; undefined where shapeKey is. */
export function shapeText(text: string, row: number, col: number): Template | undefined {
  if (text.includes("\0")) return undefined;
  let key = "";
  let from = 0;
  const literals: string[] = [];
  const cells: CellParts[] = [];
  const ok = scan(text, (type, start, end) => {
    if (type !== "Cell") return;
    const c = cellParts(text, start, end);
    if (!relativeInShape(c)) return;
    const literal = text.slice(from, start);
    literals.push(literal);
    cells.push(c);
    key += `${literal}\0${c.colFixed ? `$${c.col}` : c.col - col},${c.rowFixed ? `$${c.row}` : c.row - row}\0`;
    from = end;
  });
  if (!ok) return undefined;
  const last = text.slice(from);
  literals.push(last);
  return { key: key + last, row, col, literals, cells };
}

/**
 * True when `text` at (row, col) is the template's text copied there: the same literal text, and
 * each relative reference moved by the same rows and columns as the cell, written the same way
 * ($ signs, capitals, no leading zero). Such a copy differs from the template's text only in the
 * letters and digits of those references, which the lexer reads alike, so it has the template's
 * shapeKey: found without tokenizing, by comparing text.
 */
export function matchesTemplate(t: Template, text: string, row: number, col: number): boolean {
  let at = 0;
  for (let i = 0; i < t.cells.length; i++) {
    const literal = t.literals[i];
    if (!text.startsWith(literal, at)) return false;
    at += literal.length;
    const c = t.cells[i];
    const wantCol = c.colFixed ? c.col : c.col + col - t.col;
    const wantRow = c.rowFixed ? c.row : c.row + row - t.row;
    if (c.colFixed) {
      if (text.charCodeAt(at) !== 36) return false;
      at++;
    }
    let n = 0;
    const lettersFrom = at;
    for (; at < text.length; at++) {
      const code = text.charCodeAt(at);
      if (code < 65 || code > 90) break;
      n = n * 26 + (code - 64);
    }
    if (at === lettersFrom || at - lettersFrom > 3 || n !== wantCol) return false;
    if (c.rowFixed) {
      if (text.charCodeAt(at) !== 36) return false;
      at++;
    }
    const first = text.charCodeAt(at);
    if (first < 49 || first > 57) return false;
    n = 0;
    for (; at < text.length; at++) {
      const code = text.charCodeAt(at);
      if (code < 48 || code > 57) break;
      n = n * 10 + (code - 48);
    }
    if (n !== wantRow) return false;
  }
  const last = t.literals[t.cells.length];
  return text.length - at === last.length && text.startsWith(last, at);
}

/** What the library's parser object offers the evaluation (fast-formula-parser grammar/hooks.js and utils.js). */
export interface LibraryParser {
  position: { sheet: string; row: number; col: number };
  async: boolean;
  utils: {
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

/** The library's binary operators by precedence, highest first (grammar/parsing.js). */
const PRECEDENCE = [["^"], ["*", "/"], ["+", "-"], ["&"], ["<", ">", "=", "<>", "<=", ">="]];

class Unsupported extends Error {}

const OPERAND_START = new Set<TokenType>(["String", "SheetQuoted", "Function", "Sheet", "Cell", "Boolean", "Column", "Number", "OpenParen"]);

/** Parses the tokens by the library's grammar; throws Unsupported for what it leaves to the library. */
class Parser {
  private at = 0;
  /** With an origin, capitalised relative references are read from the evaluating cell's position (see shapeKey). */
  constructor(
    private readonly tokens: FastToken[],
    private readonly origin?: { row: number; col: number },
  ) {}

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
    // Each step folds two neighbours of the list into the left one's place; the places are worked
    // out here too, so evaluating keeps every value where it is (no splicing).
    const left: number[] = [];
    const right: number[] = [];
    const stepOps: string[] = [];
    const pending = [...ops];
    const places = values.map((_, i) => i);
    for (const level of PRECEDENCE) {
      for (let i = 0; i < pending.length; i++) {
        if (!level.includes(pending[i])) continue;
        left.push(places[i]);
        right.push(places[i + 1]);
        stepOps.push(pending[i]);
        pending.splice(i, 1);
        places.splice(i + 1, 1);
        i--;
      }
    }
    return (p) => {
      const vs: unknown[] = new Array(values.length);
      for (let i = 0; i < values.length; i++) vs[i] = values[i](p);
      for (let k = 0; k < stepOps.length; k++) vs[left[k]] = p.utils.applyInfix(vs[left[k]], stepOps[k], vs[right[k]]);
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
        // A new reference object each time, as the library's parseCellAddress gives (it fills in
        // the sheet on the reference it is given). Its `address` text is left out: the library
        // never reads it, and nothing of ours does.
        const c = cellParts(t.image);
        const origin = this.origin;
        if (!origin || !relativeInShape(c)) {
          const { row, col } = c;
          return () => ({ ref: { col, row } });
        }
        const dc = c.colFixed ? 0 : c.col - origin.col;
        const dr = c.rowFixed ? 0 : c.row - origin.row;
        const col = c.colFixed ? c.col : 0;
        const row = c.rowFixed ? c.row : 0;
        const rowOf = c.rowFixed ? () => row : (p: LibraryParser) => p.position.row + dr;
        const colOf = c.colFixed ? () => col : (p: LibraryParser) => p.position.col + dc;
        return (p) => ({ ref: { col: colOf(p), row: rowOf(p) } });
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
        return (p) => {
          const values: unknown[] = new Array(args.length);
          for (let i = 0; i < args.length; i++) values[i] = args[i] ? args[i]!(p) : null;
          return p.callFunction(name, values);
        };
      }
      default:
        throw new Unsupported();
    }
  }
}

/**
 * The formula (as its tokens) parsed for evaluation, or undefined when it is left to the library.
 * Given the cell it was written in, the result serves every formula of the same shapeKey, each
 * evaluated with the library's position set to its own cell.
 */
export function compile(tokens: FastToken[] | undefined, origin?: { row: number; col: number }): Compiled | undefined {
  if (!tokens?.length) return undefined;
  try {
    return new Parser(tokens, origin).whole();
  } catch (e) {
    if (e instanceof Unsupported) return undefined;
    throw e;
  }
}
