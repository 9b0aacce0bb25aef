/**
 * Excel's formula text as tokens, written from ECMA-376 Part 1 §18.17 (formula syntax): numbers,
 * "text" with "" for a quote, TRUE/FALSE in any case, error literals, cell references with or
 * without $, column and row parts of whole-column and whole-row ranges, sheet prefixes (plain or
 * 'quoted' with '' for a quote), function names (with their _xlfn., _xlws. and _xldudf_ stored
 * prefixes), defined names and LET/LAMBDA parameters (_xlpm.), the operators, array constants'
 * { ; }, @ (implicit intersection) and # (a spill reference). Whitespace is kept as a flag on the
 * token after it: between two references it is the intersection operator.
 *
 * The common run of a large workbook (letters then digits, digit runs) is read without patterns.
 */

type TokenType =
  | "Number"
  | "String"
  | "Bool"
  | "Error"
  | "Cell"
  | "Name"
  | "Row"
  | "Func"
  | "Sheet"
  | "Op"
  | "Percent"
  | "Colon"
  | "Comma"
  | "Semicolon"
  | "LParen"
  | "RParen"
  | "LBrace"
  | "RBrace"
  | "At"
  | "Hash";

export interface Token {
  type: TokenType;
  start: number;
  end: number;
  /** Whitespace came before it. */
  space: boolean;
}

/** Text the lexer cannot read, with where. */
export class SyntaxProblem extends Error {
  constructor(
    message: string,
    readonly at: number,
  ) {
    super(message);
  }
}

const ERROR_LITERAL = /#(?:NULL!|DIV\/0!|VALUE!|REF!|NAME\?|NUM!|N\/A|GETTING_DATA|SPILL!|CALC!|FIELD!|BLOCKED!|UNKNOWN!|BUSY!|CONNECT!|EXTERNAL!|PYTHON!)/iy;
const NUMBER = /(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?/y;
const CELL = /\$?[A-Za-z]{1,3}\$?\d+/y;
const COLUMN_PART = /\$?[A-Za-z]{1,3}(?=\s*:|$|[^A-Za-z0-9_.?\\(!])/y;
const ROW_PART = /\$\d+/y;

function isNameChar(c: number): boolean {
  return (c >= 48 && c <= 57) || (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || c === 95 || c === 46 || c === 63 || c === 92 || c >= 0xa0;
}

function isNameStart(c: number): boolean {
  return (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || c === 95 || c === 92 || c >= 0xa0;
}

function lengthAt(re: RegExp, text: string, at: number): number {
  re.lastIndex = at;
  return re.test(text) ? re.lastIndex - at : 0;
}

/** Calls `emit` for each token; throws SyntaxProblem on text that is not a formula. */
export function scanTokens(text: string, emit: (type: TokenType, start: number, end: number, space: boolean) => void): void {
  let at = 0;
  let space = false;
  let prev: TokenType | undefined;
  const push = (type: TokenType, n: number) => {
    emit(type, at, at + n, space);
    at += n;
    space = false;
    prev = type;
  };
  while (at < text.length) {
    const code = text.charCodeAt(at);
    const ch = text[at];
    if (code === 32 || code === 10 || code === 13 || code === 9 || code === 0xa0) {
      at++;
      space = true;
      continue;
    }
    if (code >= 48 && code <= 57) {
      // Digits: a number, unless digits and letters make a name (rare) or a sheet name.
      let end = at + 1;
      while (end < text.length && text.charCodeAt(end) >= 48 && text.charCodeAt(end) <= 57) end++;
      const next = text.charCodeAt(end);
      if (end >= text.length || !(isNameChar(next) || next === 33)) {
        push("Number", end - at);
        continue;
      }
      const n = lengthAt(NUMBER, text, at);
      if (n && !isNameChar(text.charCodeAt(at + n)) && text.charCodeAt(at + n) !== 33) {
        push("Number", n);
        continue;
      }
      let j = at;
      while (j < text.length && isNameChar(text.charCodeAt(j))) j++;
      if (text[j] === "!") {
        push("Sheet", j + 1 - at);
        continue;
      }
      if (n) {
        push("Number", n);
        continue;
      }
      throw new SyntaxProblem(`cannot read "${text.slice(at, j)}"`, at);
    }
    if (isNameStart(code) || code === 36) {
      // The common case first: letters then digits, nothing after that could make it longer.
      let letters = 0;
      if (code !== 36) {
        while (letters < 4) {
          const c = text.charCodeAt(at + letters) | 32;
          if (c < 97 || c > 122) break;
          letters++;
        }
      }
      if (letters >= 1 && letters <= 3) {
        const d = text.charCodeAt(at + letters);
        if (d >= 48 && d <= 57) {
          let end = at + letters + 1;
          while (end < text.length && text.charCodeAt(end) >= 48 && text.charCodeAt(end) <= 57) end++;
          const next = text.charCodeAt(end);
          if (end >= text.length || !(isNameChar(next) || next === 40 || next === 33)) {
            push("Cell", end - at);
            continue;
          }
        }
      }
      if (code === 36) {
        let n = lengthAt(CELL, text, at);
        if (n && !isNameChar(text.charCodeAt(at + n)) && text.charCodeAt(at + n) !== 40) {
          push("Cell", n);
          continue;
        }
        if ((n = lengthAt(ROW_PART, text, at))) {
          push("Row", n);
          continue;
        }
        if ((n = lengthAt(COLUMN_PART, text, at))) {
          push("Name", n);
          continue;
        }
        throw new SyntaxProblem(`cannot read "$" here`, at);
      }
      let end = at + 1;
      while (end < text.length && isNameChar(text.charCodeAt(end))) end++;
      const next = text[end];
      if (next === "!") {
        push("Sheet", end + 1 - at);
        continue;
      }
      if (next === "(") {
        push("Func", end + 1 - at);
        continue;
      }
      const n = lengthAt(CELL, text, at);
      if (n >= end - at && !isNameChar(text.charCodeAt(at + n)) && text[at + n] !== "(" && text[at + n] !== "!") {
        push("Cell", n);
        continue;
      }
      const word = text.slice(at, end).toUpperCase();
      if (word === "TRUE" || word === "FALSE") {
        push("Bool", end - at);
        continue;
      }
      push("Name", end - at);
      continue;
    }
    switch (ch) {
      case '"': {
        let j = at + 1;
        for (;;) {
          const q = text.indexOf('"', j);
          if (q < 0) throw new SyntaxProblem("a text in quotes is not closed", at);
          if (text[q + 1] === '"') j = q + 2;
          else {
            j = q + 1;
            break;
          }
        }
        push("String", j - at);
        continue;
      }
      case "'": {
        let j = at + 1;
        for (;;) {
          const q = text.indexOf("'", j);
          if (q < 0) throw new SyntaxProblem("a quoted sheet name is not closed", at);
          if (text[q + 1] === "'") j = q + 2;
          else {
            j = q + 1;
            break;
          }
        }
        if (text[j] !== "!") throw new SyntaxProblem("a quoted name must be a sheet name followed by !", at);
        push("Sheet", j + 1 - at);
        continue;
      }
      case "#": {
        const n = lengthAt(ERROR_LITERAL, text, at);
        if (n) push("Error", n);
        else if (!space && (prev === "Cell" || prev === "Name" || prev === "RParen")) push("Hash", 1);
        else throw new SyntaxProblem(`cannot read "${text.slice(at, at + 8)}"`, at);
        continue;
      }
      case ".": {
        const n = lengthAt(NUMBER, text, at);
        if (!n) throw new SyntaxProblem('cannot read "."', at);
        push("Number", n);
        continue;
      }
      case "+":
      case "-":
      case "*":
      case "/":
      case "^":
      case "&":
      case "=":
        push("Op", 1);
        continue;
      case "<":
        push("Op", text[at + 1] === "=" || text[at + 1] === ">" ? 2 : 1);
        continue;
      case ">":
        push("Op", text[at + 1] === "=" ? 2 : 1);
        continue;
      case "%":
        push("Percent", 1);
        continue;
      case ":":
        push("Colon", 1);
        continue;
      case ",":
        push("Comma", 1);
        continue;
      case ";":
        push("Semicolon", 1);
        continue;
      case "(":
        push("LParen", 1);
        continue;
      case ")":
        push("RParen", 1);
        continue;
      case "{":
        push("LBrace", 1);
        continue;
      case "}":
        push("RBrace", 1);
        continue;
      case "@":
        push("At", 1);
        continue;
      case "[":
        throw new SyntaxProblem("structured references and other workbooks ([ ]) are not supported", at);
      default:
        throw new SyntaxProblem(`cannot read "${ch}"`, at);
    }
  }
}

/** The tokens of a formula (without "="); throws SyntaxProblem. */
export function lex(text: string): Token[] {
  const out: Token[] = [];
  scanTokens(text, (type, start, end, space) => out.push({ type, start, end, space }));
  return out;
}
