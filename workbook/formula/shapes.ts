/**
 * Formulas filled down a column share one parse. A formula's *shape* is its text with each
 * capitalised relative cell reference written as an offset from its cell: `=A5*2+1` in B5 and
 * `=A6*2+1` in B6 have one shape, one tree and one compiled form, each evaluated at its own cell.
 *
 * A copy is recognised without tokenizing it again (matchesTemplate): the same literal text, and
 * each relative reference moved by the cell's offset and written the same way ($ signs, capitals,
 * no leading zero). Two texts with one key differ only in the letters and digits of references
 * pointing the same way from their cells, which the lexer reads alike.
 */
import { scanTokens, SyntaxProblem } from "./lexer";

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
function relativeInShape(c: CellParts): boolean {
  return c.upper && !(c.colFixed && c.rowFixed);
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

/** The key of a formula's shape at a cell; undefined for text the lexer cannot read. */
export function shapeKey(text: string, row: number, col: number): string | undefined {
  return shapeText(text, row, col)?.key;
}

/** The formula's shapeKey with what matchesTemplate needs; undefined where shapeKey is. */
export function shapeText(text: string, row: number, col: number): Template | undefined {
  if (text.includes("\0")) return undefined;
  let key = "";
  let from = 0;
  const literals: string[] = [];
  const cells: CellParts[] = [];
  try {
    scanTokens(text, (type, start, end) => {
      if (type !== "Cell") return;
      const c = cellParts(text, start, end);
      if (!relativeInShape(c)) return;
      const literal = text.slice(from, start);
      literals.push(literal);
      cells.push(c);
      key += `${literal}\0${c.colFixed ? `$${c.col}` : c.col - col},${c.rowFixed ? `$${c.row}` : c.row - row}\0`;
      from = end;
    });
  } catch (e) {
    if (e instanceof SyntaxProblem) return undefined;
    throw e;
  }
  const last = text.slice(from);
  literals.push(last);
  return { key: key + last, row, col, literals, cells };
}

/**
 * True when `text` at (row, col) is the template's text copied there: the same literal text, and
 * each relative reference moved by the same rows and columns as the cell, written the same way.
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
