/**
 * Excel's formula grammar as a tree (ECMA-376 Part 1 §18.17; operator precedence as Microsoft's
 * "Calculation operators and precedence in Excel" gives it, highest first): the reference
 * operators `:` (range) and space (intersection); negation; `%`; `^` (left to right, so
 * 2^3^2 = 64, and -2^2 = 4); `*` and `/`; `+` and `-`; `&`; then the comparisons. Also @ (implicit
 * intersection), # after a reference (its spill), array constants {1,2;3,4}, calls, a call's
 * result called again (a LAMBDA: `LAMBDA(x, x+1)(2)`).
 */
import { type Token, lex } from "./lexer";
import { MAX_COLUMN, MAX_ROW } from "./values";
import { cellParts } from "./shapes";

export interface CellNode {
  k: "cell";
  sheet?: string;
  row: number;
  col: number;
  rowFixed: boolean;
  colFixed: boolean;
  /** Written in capitals (only these are shared by formulas filled down a column). */
  upper: boolean;
  start: number;
  end: number;
}

export type Node =
  | { k: "num"; v: number }
  | { k: "str"; v: string }
  | { k: "bool"; v: boolean }
  | { k: "err"; code: string }
  | { k: "array"; rows: (number | string | boolean | { code: string })[][] }
  | CellNode
  | { k: "cols"; sheet?: string; c1: number; c2: number }
  | { k: "rows"; sheet?: string; r1: number; r2: number }
  | { k: "area"; sheet?: string; a: CellNode; b: CellNode }
  | { k: "range"; a: Node; b: Node }
  | { k: "isect"; a: Node; b: Node }
  | { k: "name"; name: string; sheet?: string }
  | { k: "call"; name: string; args: (Node | null)[]; start: number; end: number }
  | { k: "invoke"; fn: Node; args: (Node | null)[] }
  | { k: "unary"; op: "-" | "+"; x: Node }
  | { k: "pct"; x: Node }
  | { k: "bin"; op: string; a: Node; b: Node }
  | { k: "spill"; x: Node }
  | { k: "at"; x: Node }
  | { k: "union"; items: Node[] };

/** A formula that does not follow the grammar, with what was expected. */
export class ParseProblem extends Error {}

const COMPARISONS = new Set(["=", "<>", "<", ">", "<=", ">="]);

function sheetName(image: string): string {
  const name = image.slice(0, -1);
  return name.startsWith("'") ? name.slice(1, -1).replace(/''/g, "'") : name;
}

function columnOf(letters: string): number {
  let n = 0;
  for (const ch of letters.toUpperCase()) n = n * 26 + (ch.charCodeAt(0) - 64);
  return n;
}

function cellNode(text: string, start: number, end: number, sheet?: string): CellNode {
  return { k: "cell", sheet, ...cellParts(text, start, end), start, end };
}

class Parser {
  private at = 0;
  constructor(
    private readonly text: string,
    private readonly tokens: Token[],
  ) {}

  private peek(offset = 0): Token | undefined {
    return this.tokens[this.at + offset];
  }

  private image(t: Token): string {
    return this.text.slice(t.start, t.end);
  }

  private isOp(t: Token | undefined, ...ops: string[]): boolean {
    return !!t && t.type === "Op" && ops.includes(this.image(t));
  }

  private expect(type: Token["type"], what: string): Token {
    const t = this.peek();
    if (!t || t.type !== type) throw new ParseProblem(`${what} expected${t ? ` before "${this.image(t)}"` : " at the end"}`);
    this.at++;
    return t;
  }

  whole(): Node {
    if (!this.tokens.length) throw new ParseProblem("the formula is empty");
    const n = this.comparison();
    const t = this.peek();
    if (t) throw new ParseProblem(`unexpected "${this.image(t)}"`);
    return n;
  }

  private comparison(): Node {
    let a = this.concat();
    for (let t = this.peek(); t && t.type === "Op" && COMPARISONS.has(this.image(t)); t = this.peek()) {
      this.at++;
      a = { k: "bin", op: this.image(t), a, b: this.concat() };
    }
    return a;
  }

  private concat(): Node {
    let a = this.additive();
    while (this.isOp(this.peek(), "&")) {
      this.at++;
      a = { k: "bin", op: "&", a, b: this.additive() };
    }
    return a;
  }

  private additive(): Node {
    let a = this.multiplicative();
    for (let t = this.peek(); this.isOp(t, "+", "-"); t = this.peek()) {
      this.at++;
      a = { k: "bin", op: this.image(t!), a, b: this.multiplicative() };
    }
    return a;
  }

  private multiplicative(): Node {
    let a = this.power();
    for (let t = this.peek(); this.isOp(t, "*", "/"); t = this.peek()) {
      this.at++;
      a = { k: "bin", op: this.image(t!), a, b: this.power() };
    }
    return a;
  }

  private power(): Node {
    let a = this.percent();
    while (this.isOp(this.peek(), "^")) {
      this.at++;
      a = { k: "bin", op: "^", a, b: this.percent() };
    }
    return a;
  }

  private percent(): Node {
    let x = this.unary();
    while (this.peek()?.type === "Percent") {
      this.at++;
      x = { k: "pct", x };
    }
    return x;
  }

  private unary(): Node {
    const t = this.peek();
    if (this.isOp(t, "-", "+")) {
      this.at++;
      return { k: "unary", op: this.image(t!) as "-" | "+", x: this.unary() };
    }
    if (t?.type === "At") {
      this.at++;
      return { k: "at", x: this.unary() };
    }
    return this.intersection();
  }

  private intersection(): Node {
    let a = this.range();
    for (let t = this.peek(); t && t.space && this.startsOperand(t); t = this.peek()) a = { k: "isect", a, b: this.range() };
    return a;
  }

  private startsOperand(t: Token): boolean {
    return t.type === "Cell" || t.type === "Sheet" || t.type === "Name" || t.type === "Func" || t.type === "LParen" || t.type === "Row";
  }

  private range(): Node {
    let a = this.postfix();
    while (this.peek()?.type === "Colon") {
      this.at++;
      a = this.joinRange(a, this.postfix());
    }
    return a;
  }

  /** A:B of two plain references on one sheet is an area; anything else a range operator. */
  private joinRange(a: Node, b: Node): Node {
    if (a.k === "cell" && b.k === "cell" && !b.sheet) return { k: "area", sheet: a.sheet, a, b };
    return { k: "range", a, b };
  }

  private postfix(): Node {
    let x = this.primary();
    for (;;) {
      const t = this.peek();
      if (t?.type === "Hash" && !t.space) {
        this.at++;
        x = { k: "spill", x };
      } else if (t?.type === "LParen" && !t.space && (x.k === "call" || x.k === "invoke")) {
        this.at++;
        x = { k: "invoke", fn: x, args: this.args() };
      } else return x;
    }
  }

  private args(): (Node | null)[] {
    const args: (Node | null)[] = [];
    if (this.peek()?.type === "RParen") {
      this.at++;
      return args;
    }
    for (;;) {
      const t = this.peek();
      if (t?.type === "Comma" || t?.type === "RParen") args.push(null);
      else args.push(this.comparison());
      const sep = this.peek();
      if (sep?.type === "Comma") {
        this.at++;
        continue;
      }
      this.expect("RParen", '")"');
      return args;
    }
  }

  /** A column part (A in A:C) or row part (3 in 3:5) after a sheet prefix or before a colon. */
  private wholeLine(sheet: string | undefined): Node | undefined {
    const t = this.peek();
    const next = this.peek(1);
    const after = this.peek(2);
    if (!t || next?.type !== "Colon" || !after) return undefined;
    const a = this.image(t).replace(/\$/g, "");
    const b = this.image(after).replace(/\$/g, "");
    if ((t.type === "Name" || t.type === "Bool") && (after.type === "Name" || after.type === "Bool") && /^[A-Za-z]{1,3}$/.test(a) && /^[A-Za-z]{1,3}$/.test(b)) {
      const c1 = columnOf(a);
      const c2 = columnOf(b);
      if (c1 > MAX_COLUMN || c2 > MAX_COLUMN) return undefined;
      this.at += 3;
      return { k: "cols", sheet, c1: Math.min(c1, c2), c2: Math.max(c1, c2) };
    }
    if ((t.type === "Number" || t.type === "Row") && (after.type === "Number" || after.type === "Row") && /^\d+$/.test(a) && /^\d+$/.test(b)) {
      const r1 = Number(a);
      const r2 = Number(b);
      if (r1 < 1 || r2 < 1 || r1 > MAX_ROW || r2 > MAX_ROW) return undefined;
      this.at += 3;
      return { k: "rows", sheet, r1: Math.min(r1, r2), r2: Math.max(r1, r2) };
    }
    return undefined;
  }

  private primary(): Node {
    const t = this.peek();
    if (!t) throw new ParseProblem("a value expected at the end");
    const line = this.wholeLine(undefined);
    if (line) return line;
    switch (t.type) {
      case "Number":
        this.at++;
        return { k: "num", v: Number(this.image(t)) };
      case "String":
        this.at++;
        return { k: "str", v: this.image(t).slice(1, -1).replace(/""/g, '"') };
      case "Bool":
        this.at++;
        return { k: "bool", v: this.image(t).toUpperCase() === "TRUE" };
      case "Error":
        this.at++;
        return { k: "err", code: this.image(t).toUpperCase() };
      case "Cell":
        this.at++;
        return cellNode(this.text, t.start, t.end);
      case "Name":
        this.at++;
        return { k: "name", name: this.image(t) };
      case "Sheet": {
        this.at++;
        const sheet = sheetName(this.image(t));
        const line2 = this.wholeLine(sheet);
        if (line2) return line2;
        const u = this.peek();
        if (u?.type === "Cell") {
          this.at++;
          const a = cellNode(this.text, u.start, u.end, sheet);
          if (this.peek()?.type === "Colon" && this.peek(1)?.type === "Cell") {
            const v = this.peek(1)!;
            this.at += 2;
            return { k: "area", sheet, a, b: cellNode(this.text, v.start, v.end, sheet) };
          }
          return a;
        }
        if (u?.type === "Error") {
          this.at++;
          return { k: "err", code: this.image(u).toUpperCase() };
        }
        if (u?.type === "Name") {
          this.at++;
          return { k: "name", name: this.image(u), sheet };
        }
        throw new ParseProblem(`a cell reference expected after "${this.image(t)}"`);
      }
      case "Func": {
        this.at++;
        const name = this.image(t).slice(0, -1);
        const args = this.args();
        return { k: "call", name, args, start: t.start, end: this.tokens[this.at - 1].end };
      }
      case "LParen": {
        this.at++;
        const first = this.comparison();
        if (this.peek()?.type === "Comma") {
          const items = [first];
          while (this.peek()?.type === "Comma") {
            this.at++;
            items.push(this.comparison());
          }
          this.expect("RParen", '")"');
          return { k: "union", items };
        }
        this.expect("RParen", '")"');
        return first;
      }
      case "LBrace":
        this.at++;
        return this.arrayConstant();
      default:
        throw new ParseProblem(`unexpected "${this.image(t)}"`);
    }
  }

  private arrayConstant(): Node {
    const rows: (number | string | boolean | { code: string })[][] = [[]];
    for (;;) {
      let t = this.peek();
      let sign = 1;
      while (this.isOp(t, "-", "+")) {
        if (this.image(t!) === "-") sign = -sign;
        this.at++;
        t = this.peek();
      }
      if (!t) throw new ParseProblem('"}" expected at the end');
      this.at++;
      const row = rows[rows.length - 1];
      if (t.type === "Number") row.push(sign * Number(this.image(t)));
      else if (t.type === "String") row.push(this.image(t).slice(1, -1).replace(/""/g, '"'));
      else if (t.type === "Bool") row.push(this.image(t).toUpperCase() === "TRUE");
      else if (t.type === "Error") row.push({ code: this.image(t).toUpperCase() });
      else throw new ParseProblem(`an array constant holds numbers, text, TRUE/FALSE or errors, not "${this.image(t)}"`);
      const sep = this.peek();
      this.at++;
      if (sep?.type === "Comma") continue;
      if (sep?.type === "Semicolon") {
        rows.push([]);
        continue;
      }
      if (sep?.type === "RBrace") break;
      throw new ParseProblem('"," ";" or "}" expected in an array constant');
    }
    if (rows.some((r) => r.length !== rows[0].length)) throw new ParseProblem("every row of an array constant needs the same number of values");
    return { k: "array", rows };
  }
}

/** The formula (without "=") as a tree; throws SyntaxProblem or ParseProblem. */
export function parse(text: string, tokens: Token[] = lex(text)): Node {
  return new Parser(text, tokens).whole();
}
