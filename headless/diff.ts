/**
 * What changed between two revisions of a calculation workbook (nappe diff), for a reviewer:
 * sheets added, removed or renamed; rows and columns inserted or deleted, followed by their
 * labels so that an inserted row does not show as every cell below it changing; inputs that
 * changed (label, old → new); formulas that changed (as displayed, references followed through
 * the inserted rows); NAPPE results that moved (old → new, relative change, unit); statuses and
 * warnings that appeared or cleared. Pure: two models and their recalculations in, a model out.
 */
import { addressOf, parseAddress } from "../workbook/address";
import { lex } from "../workbook/formula/lexer";
import { formatNumber, formatUnit } from "../workbook/format";
import { type CellModel, type CellValue, labelSource, type SheetModel, type WorkbookModel } from "../workbook/model";
import type { CellOutcome, RecalcResult, Status } from "../workbook/recalc";
import { displayFormula, hasNappeCall } from "../workbook/storedForm";
import { declaredUnit } from "../workbook/unitCheck";
import { plural } from "../workbook/format";

interface Side {
  wb: WorkbookModel;
  result: RecalcResult;
}

interface Placed {
  sheet: string;
  cell: string;
  label: string;
}

export interface WorkbookDiff {
  sheets: { added: string[]; removed: string[]; renamed: { from: string; to: string }[] };
  /** Rows and columns inserted or deleted, by sheet, with their labels. */
  lines: { sheet: string; kind: "row" | "column"; change: "inserted" | "deleted"; at: string; label: string }[];
  inputs: (Placed & { old: string; new: string; unit: string })[];
  formulas: (Placed & { old: string; new: string })[];
  results: (Placed & { old: string; new: string; unit: string; relative: number | null; beyond: boolean })[];
  statuses: (Placed & { old: Status | "none"; new: Status | "none"; worse: boolean; appeared: string[]; cleared: string[] })[];
  /** Cells added or removed outside inserted or deleted rows and columns. */
  cells: (Placed & { change: "added" | "removed"; text: string })[];
  tolerance: number;
}

const RANK: Record<Status | "none", number> = { none: 0, ok: 0, warning: 1, error: 2 };

/** What identifies a row: its text cells (labels); a row without text, its content. */
function rowKeys(sheet: SheetModel, rows: number[]): string[] {
  const by = new Map<number, CellModel[]>();
  for (const c of sheet.cells.values()) (by.get(c.row) ?? by.set(c.row, []).get(c.row)!).push(c);
  return rows.map((r) => {
    const cells = (by.get(r) ?? []).sort((a, b) => a.col - b.col);
    const text = cells.filter((c) => typeof c.value === "string" && !c.formula).map((c) => c.value);
    return text.length ? `t:${text.join("|")}` : `v:${cells.map((c) => c.formula ?? String(c.value)).join("|")}`;
  });
}

/** What identifies a column: its first text cell from the top (its header or first label). */
function columnKeys(sheet: SheetModel, cols: number[]): string[] {
  const first = new Map<number, CellModel>();
  for (const c of sheet.cells.values()) if (typeof c.value === "string" && !c.formula && (!first.has(c.col) || first.get(c.col)!.row > c.row)) first.set(c.col, c);
  return cols.map((c) => (first.has(c) ? `t:${first.get(c)!.value}` : `n:${c}`));
}

/**
 * Pairs old and new lines by key with a longest common subsequence, then pairs what is left in
 * each gap between two matched lines in order, as many as both sides have (an edited number in a
 * row without labels). Returns old line → new line.
 */
function alignLines(oldLines: number[], newLines: number[], oldKeys: string[], newKeys: string[]): Map<number, number> {
  const n = oldLines.length;
  const m = newLines.length;
  const pairs: [number, number][] = [];
  if (n * m <= 16_000_000) {
    // Lengths of the common subsequence of the suffixes (Uint32: a row is a line of the table).
    const w = m + 1;
    const L = new Uint32Array((n + 1) * w);
    for (let i = n - 1; i >= 0; i--) for (let j = m - 1; j >= 0; j--) L[i * w + j] = oldKeys[i] === newKeys[j] ? L[(i + 1) * w + j + 1] + 1 : Math.max(L[(i + 1) * w + j], L[i * w + j + 1]);
    let i = 0;
    let j = 0;
    while (i < n && j < m) {
      if (oldKeys[i] === newKeys[j]) pairs.push([i++, j++]);
      else if (L[(i + 1) * w + j] >= L[i * w + j + 1]) i++;
      else j++;
    }
  } else for (let i = 0; i < Math.min(n, m); i++) pairs.push([i, i]);
  // The gaps between matches, paired in order where both sides have the same number of lines.
  const all: [number, number][] = [];
  let pi = 0;
  let pj = 0;
  for (const [i, j] of [...pairs, [n, m] as [number, number]]) {
    if (i - pi === j - pj) for (let k = 0; k < i - pi; k++) all.push([pi + k, pj + k]);
    if (i < n) all.push([i, j]);
    pi = i + 1;
    pj = j + 1;
  }
  return new Map(all.map(([i, j]) => [oldLines[i], newLines[j]]));
}

function linesOf(sheet: SheetModel, axis: "row" | "col"): number[] {
  return [...new Set([...sheet.cells.values()].map((c) => c[axis]))].sort((a, b) => a - b);
}

/** How similar two sheets' constants are (0 to 1): a renamed sheet keeps most of its cells. */
function similarity(a: SheetModel, b: SheetModel): number {
  const text = (s: SheetModel) => new Set([...s.cells.values()].map((c) => `${c.formula ?? ""}\u0000${String(c.value)}`));
  const x = text(a);
  const y = text(b);
  let same = 0;
  for (const t of x) if (y.has(t)) same++;
  return same / Math.max(1, Math.max(x.size, y.size));
}

/** A formula of the old revision with its references moved to where their cells now are. */
function followed(formula: string, home: string, move: (sheet: string, row: number, col: number) => { sheet: string; row: number; col: number } | undefined): string {
  let tokens;
  try {
    tokens = lex(formula);
  } catch {
    return formula;
  }
  let out = "";
  let at = 0;
  tokens.forEach((t, i) => {
    if (t.type !== "Cell") return;
    const prev = tokens[i - 1];
    const named = prev?.type === "Sheet" && prev.end === t.start;
    const sheetText = named ? formula.slice(prev.start, prev.end - 1) : "";
    const sheet = named ? sheetText.replace(/^'(.*)'$/, "$1").replace(/''/g, "'") : home;
    const text = formula.slice(t.start, t.end);
    const m = /^(\$?)([A-Za-z]{1,3})(\$?)(\d+)$/.exec(text);
    if (!m) return;
    const { row, col } = parseAddress(`${m[2]}${m[4]}`);
    const to = move(sheet, row, col);
    const start = named ? prev.start : t.start;
    out += formula.slice(at, start);
    if (!to) out += `${named ? `${sheetText}!` : ""}#REF!`;
    else {
      const letters = addressOf(to.row, to.col).replace(/\d+$/, "");
      const sheetPart = named ? `${/^[A-Za-z_][A-Za-z0-9_.]*$/.test(to.sheet) ? to.sheet : `'${to.sheet.replace(/'/g, "''")}'`}!` : "";
      out += `${sheetPart}${m[1]}${letters}${m[3]}${to.row}`;
    }
    at = t.end;
  });
  return out + formula.slice(at);
}

/** Where an empty line (no cell in it) went: after the used range, shifted as the last line was; inside it, after the line above it. */
function nearest(map: Map<number, number>, x: number, last: number, shift: number): number | undefined {
  if (x > last) return x + shift;
  for (let above = x - 1; above >= 1; above--) {
    if (!map.has(above)) continue;
    return map.get(above)! + (x - above);
  }
  return x;
}

/** Whitespace outside strings does not change a formula. */
function canonical(formula: string): string {
  return formula.replace(/("(?:[^"]|"")*")|\s+/g, (_, s: string | undefined) => s ?? "");
}

function shownValue(v: CellValue | CellValue[][]): string {
  if (Array.isArray(v)) return `${v.length} ${v.length === 1 ? "row" : "rows"}`;
  if (typeof v === "number") return formatNumber(v);
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  return v === null ? "(empty)" : String(v);
}

function sameValue(a: CellValue | CellValue[][], b: CellValue | CellValue[][]): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/**
 * How a value changed: the two as shown, with the figures the change needs to show; the
 * relative change (the largest of a spilled table's numbers), and the size of the values.
 */
function change(a: CellValue | CellValue[][], b: CellValue | CellValue[][]): { old: string; new: string; relative: number | null; size: number } {
  const rel = (x: number, y: number) => (x === y ? 0 : x === 0 ? Infinity : (y - x) / Math.abs(x));
  if (typeof a === "number" && typeof b === "number") {
    const relative = rel(a, b);
    const digits = Math.min(12, Math.max(4, Number.isFinite(relative) && relative !== 0 ? Math.ceil(-Math.log10(Math.abs(relative))) + 2 : 4));
    return { old: formatNumber(a, digits), new: formatNumber(b, digits), relative, size: Math.max(Math.abs(a), Math.abs(b)) };
  }
  if (Array.isArray(a) && Array.isArray(b) && a.length === b.length && a.every((r, i) => r.length === b[i].length)) {
    let worst = 0;
    let size = 0;
    let changed = 0;
    a.forEach((r, i) =>
      r.forEach((x, j) => {
        const y = b[i][j];
        if (x === y) return;
        changed++;
        if (typeof x === "number" && typeof y === "number") {
          const r2 = rel(x, y);
          if (Math.abs(r2) > Math.abs(worst)) worst = r2;
          size = Math.max(size, Math.abs(x), Math.abs(y));
        } else worst = Infinity;
      }),
    );
    return { old: shownValue(a), new: `${shownValue(b)}, ${changed} ${changed === 1 ? "value" : "values"} changed`, relative: Number.isFinite(worst) ? worst : null, size };
  }
  return { old: shownValue(a), new: shownValue(b), relative: null, size: Infinity };
}

/** Compares two revisions. `tolerance`: the relative change of a NAPPE result that counts as moved. */
export function diffWorkbooks(before: Side, after: Side, tolerance = 1e-9): WorkbookDiff {
  const diff: WorkbookDiff = { sheets: { added: [], removed: [], renamed: [] }, lines: [], inputs: [], formulas: [], results: [], statuses: [], cells: [], tolerance };
  const oldNames = new Map(before.wb.sheets.map((s) => [s.name.toLowerCase(), s]));
  const newNames = new Map(after.wb.sheets.map((s) => [s.name.toLowerCase(), s]));
  const pairs: [SheetModel, SheetModel][] = [];
  for (const s of before.wb.sheets) if (newNames.has(s.name.toLowerCase())) pairs.push([s, newNames.get(s.name.toLowerCase())!]);
  const oldOnly = before.wb.sheets.filter((s) => !newNames.has(s.name.toLowerCase()));
  const newOnly = after.wb.sheets.filter((s) => !oldNames.has(s.name.toLowerCase()));
  for (const o of oldOnly) {
    const best = newOnly.map((n) => ({ n, score: similarity(o, n) })).sort((a, b) => b.score - a.score)[0];
    if (best && best.score >= 0.6 && !pairs.some(([, n]) => n === best.n)) {
      pairs.push([o, best.n]);
      diff.sheets.renamed.push({ from: o.name, to: best.n.name });
    } else diff.sheets.removed.push(o.name);
  }
  for (const n of newOnly) if (!pairs.some(([, x]) => x === n)) diff.sheets.added.push(n.name);

  // Where each old cell now is: its sheet's row and column maps.
  const maps = new Map<string, { to: SheetModel; rows: Map<number, number>; cols: Map<number, number>; lastRow: number; lastCol: number; rowShift: number; colShift: number }>();
  for (const [o, n] of pairs) {
    const oldRows = linesOf(o, "row");
    const newRows = linesOf(n, "row");
    const oldCols = linesOf(o, "col");
    const newCols = linesOf(n, "col");
    const rows = alignLines(oldRows, newRows, rowKeys(o, oldRows), rowKeys(n, newRows));
    const cols = alignLines(oldCols, newCols, columnKeys(o, oldCols), columnKeys(n, newCols));
    maps.set(o.name.toLowerCase(), { to: n, rows, cols, lastRow: Math.max(0, ...rows.keys()), lastCol: Math.max(0, ...cols.keys()), rowShift: rows.size ? Math.max(...rows.values()) - Math.max(...rows.keys()) : 0, colShift: cols.size ? Math.max(...cols.values()) - Math.max(...cols.keys()) : 0 });
    const rowLabel = (s: SheetModel, r: number) => [...s.cells.values()].filter((c) => c.row === r && typeof c.value === "string" && !c.formula).sort((a, b) => a.col - b.col)[0]?.value as string | undefined;
    const colLabel = (s: SheetModel, col: number) => [...s.cells.values()].filter((c) => c.col === col && typeof c.value === "string" && !c.formula).sort((a, b) => a.row - b.row)[0]?.value as string | undefined;
    const mappedRows = new Set(rows.values());
    const mappedCols = new Set(cols.values());
    for (const r of oldRows) if (!rows.has(r)) diff.lines.push({ sheet: o.name, kind: "row", change: "deleted", at: String(r), label: rowLabel(o, r) ?? "" });
    for (const r of newRows) if (!mappedRows.has(r)) diff.lines.push({ sheet: n.name, kind: "row", change: "inserted", at: String(r), label: rowLabel(n, r) ?? "" });
    for (const c of oldCols) if (!cols.has(c)) diff.lines.push({ sheet: o.name, kind: "column", change: "deleted", at: addressOf(1, c).replace(/\d+$/, ""), label: colLabel(o, c) ?? "" });
    for (const c of newCols) if (!mappedCols.has(c)) diff.lines.push({ sheet: n.name, kind: "column", change: "inserted", at: addressOf(1, c).replace(/\d+$/, ""), label: colLabel(n, c) ?? "" });
  }
  const move = (sheet: string, row: number, col: number) => {
    const m = maps.get(sheet.toLowerCase());
    if (!m) return undefined;
    // A reference to an empty cell between lines, or past the used range, keeps its place relative to the lines around it.
    const r = m.rows.get(row) ?? nearest(m.rows, row, m.lastRow, m.rowShift);
    const c = m.cols.get(col) ?? nearest(m.cols, col, m.lastCol, m.colShift);
    return r === undefined || c === undefined ? undefined : { sheet: m.to.name, row: r, col: c };
  };
  const outcomes = (s: Side) => new Map(s.result.cells.map((c) => [`${c.sheet.toLowerCase()}!${c.address}`, c]));
  const oldOut = outcomes(before);
  const newOut = outcomes(after);
  const newLabels = labelSource(after.wb);
  const oldLabels = labelSource(before.wb);
  for (const [o, n] of pairs) {
    const { rows, cols } = maps.get(o.name.toLowerCase())!;
    const seen = new Set<string>();
    for (const oc of o.cells.values()) {
      const r = rows.get(oc.row);
      const c = cols.get(oc.col);
      if (r === undefined || c === undefined) continue;
      const address = addressOf(r, c);
      seen.add(address);
      const nc = n.cells.get(`${r}:${c}`);
      const label = newLabels.labelsNear(n.name, r, c)[0] ?? oldLabels.labelsNear(o.name, oc.row, oc.col)[0] ?? "";
      const place = { sheet: n.name, cell: address, label };
      compareCell(diff, place, oc, nc, o.name, oldOut.get(`${o.name.toLowerCase()}!${oc.address}`), newOut.get(`${n.name.toLowerCase()}!${address}`), before, after, move);
    }
    for (const nc of n.cells.values()) {
      if (seen.has(nc.address)) continue;
      const rowInserted = ![...rows.values()].includes(nc.row);
      const colInserted = ![...cols.values()].includes(nc.col);
      const place = { sheet: n.name, cell: nc.address, label: newLabels.labelsNear(n.name, nc.row, nc.col)[0] ?? "" };
      if (!rowInserted && !colInserted) diff.cells.push({ ...place, change: "added", text: nc.formula ? `=${displayFormula(nc.formula)}` : shownValue(nc.value) });
      const out = newOut.get(`${n.name.toLowerCase()}!${nc.address}`);
      if (out && out.status !== "ok") diff.statuses.push({ ...place, old: "none", new: out.status, worse: true, appeared: out.messages, cleared: [] });
    }
  }
  // Cells of sheets added or removed are the sheet's change: their NAPPE statuses still count.
  for (const name of diff.sheets.added) {
    for (const out of after.result.cells) if (out.sheet === name && out.status !== "ok") diff.statuses.push({ sheet: name, cell: out.address, label: "", old: "none", new: out.status, worse: true, appeared: out.messages, cleared: [] });
  }
  return diff;
}

function compareCell(diff: WorkbookDiff, place: Placed, oc: CellModel, nc: CellModel | undefined, oldSheet: string, oldOut: CellOutcome | undefined, newOut: CellOutcome | undefined, before: Side, after: Side, move: (sheet: string, row: number, col: number) => { sheet: string; row: number; col: number } | undefined): void {
  if (!nc) {
    diff.cells.push({ ...place, change: "removed", text: oc.formula ? `=${displayFormula(oc.formula)}` : shownValue(oc.value) });
    return;
  }
  if (!oc.formula && !nc.formula) {
    if (!sameValue(oc.value, nc.value)) {
      // The unit its label declares, or a unit written in the cell to its right ("1850 | m").
      const right = after.wb.sheets.find((x) => x.name === place.sheet)?.cells.get(`${nc.row}:${nc.col + 1}`)?.value;
      const declared = declaredUnit(place.label) ?? (typeof right === "string" && right.length <= 12 ? declaredUnit(right) : undefined);
      diff.inputs.push({ ...place, old: shownValue(oc.value), new: shownValue(nc.value), unit: declared ? formatUnit(declared.unit) : "" });
    }
    return;
  }
  const oldText = oc.formula ? `=${displayFormula(followed(oc.formula, oldSheet, move))}` : shownValue(oc.value);
  const newText = nc.formula ? `=${displayFormula(nc.formula)}` : shownValue(nc.value);
  if (canonical(oldText) !== canonical(newText)) diff.formulas.push({ ...place, old: oc.formula ? `=${displayFormula(oc.formula)}` : oldText, new: newText });
  const nappe = (oc.formula && hasNappeCall(oc.formula)) || (nc.formula && hasNappeCall(nc.formula));
  if (nappe) {
    const a = oc.formula ? before.result.valueOf(oldSheet, oc.address) : oc.value;
    const b = nc.formula ? after.result.valueOf(place.sheet, place.cell) : nc.value;
    if (!sameValue(a, b)) {
      const unit = formatUnit(newOut?.unit || oldOut?.unit || "");
      const moved = change(a, b);
      // Relative; two values that are both zero to 12 places (a cross-check's 2×10⁻¹³ against 1×10⁻¹³) have not moved.
      const beyond = moved.relative === null || (Math.abs(moved.relative) > diff.tolerance && moved.size > 1e-12);
      diff.results.push({ ...place, old: moved.old, new: moved.new, unit, relative: moved.relative, beyond });
    }
    const os: Status | "none" = oldOut?.status ?? "none";
    const ns: Status | "none" = newOut?.status ?? "none";
    const appeared = (newOut?.messages ?? []).filter((m) => !(oldOut?.messages ?? []).includes(m));
    const cleared = (oldOut?.messages ?? []).filter((m) => !(newOut?.messages ?? []).includes(m));
    if (os !== ns || appeared.length || cleared.length) diff.statuses.push({ ...place, old: os, new: ns, worse: RANK[ns] > RANK[os], appeared, cleared });
  }
}

/** Exit status of a diff: 1 when a NAPPE result moved beyond the tolerance or a status got worse. */
export function diffExit(d: WorkbookDiff): 0 | 1 {
  return d.results.some((r) => r.beyond) || d.statuses.some((s) => s.worse) ? 1 : 0;
}

function percent(relative: number | null): string {
  if (relative === null) return "";
  // From (about) zero a percentage means nothing: a cross-check's 2×10⁻¹³ becoming -3.4×10⁻⁴.
  if (!Number.isFinite(relative) || Math.abs(relative) >= 100) return " (from about zero)";
  return ` (${relative > 0 ? "+" : ""}${formatNumber(relative * 100, 3)} %)`;
}

/** The diff as lines for people. */
export function diffLines(d: WorkbookDiff, names: { old: string; new: string }): string[] {
  const out = [`nappe diff: ${names.old} → ${names.new}`];
  const at = (p: Placed) => `${p.sheet}!${p.cell}${p.label ? ` "${p.label}"` : ""}`;
  const s = d.sheets;
  if (s.added.length || s.removed.length || s.renamed.length) {
    out.push("", "Sheets:");
    for (const r of s.renamed) out.push(`  renamed "${r.from}" → "${r.to}"`);
    for (const a of s.added) out.push(`  added "${a}"`);
    for (const r of s.removed) out.push(`  removed "${r}"`);
  }
  if (d.lines.length) {
    out.push("", "Rows and columns:");
    for (const l of d.lines) out.push(`  ${l.sheet}: ${l.kind} ${l.at} ${l.change}${l.label ? ` ("${l.label}")` : ""}`);
  }
  if (d.inputs.length) {
    out.push("", `Inputs changed (${d.inputs.length}):`);
    for (const i of d.inputs) out.push(`  ${at(i)}: ${i.old} → ${i.new}${i.unit ? ` ${i.unit}` : ""}`);
  }
  if (d.formulas.length) {
    out.push("", `Formulas changed (${d.formulas.length}):`);
    for (const f of d.formulas) out.push(`  ${at(f)}:`, `    was ${f.old}`, `    now ${f.new}`);
  }
  if (d.results.length) {
    out.push("", `NAPPE results moved (${d.results.length}; beyond a relative ${d.tolerance}: ${d.results.filter((r) => r.beyond).length}):`);
    for (const r of d.results) out.push(`  ${at(r)}: ${r.old} → ${r.new}${r.unit ? ` ${r.unit}` : ""}${percent(r.relative)}${r.beyond ? "" : " (within the tolerance)"}`);
  }
  if (d.statuses.length) {
    out.push("", `Statuses and warnings (${d.statuses.length}):`);
    for (const x of d.statuses) {
      out.push(`  ${at(x)}: ${x.old} → ${x.new}${x.worse ? " (worse)" : RANK[x.new] < RANK[x.old] ? " (better)" : ""}`);
      for (const m of x.appeared) out.push(`    + ${m}`);
      for (const m of x.cleared) out.push(`    - ${m}`);
    }
  }
  if (d.cells.length) {
    out.push("", `Cells added or removed (${d.cells.length}):`);
    for (const c of d.cells) out.push(`  ${at(c)}: ${c.change} ${c.text}`);
  }
  const nothing = !(s.added.length || s.removed.length || s.renamed.length || d.lines.length || d.inputs.length || d.formulas.length || d.results.length || d.statuses.length || d.cells.length);
  out.push("", nothing ? "No change." : `${plural(d.inputs.length, "input")} and ${plural(d.formulas.length, "formula")} changed; ${plural(d.results.filter((r) => r.beyond).length, "NAPPE result")} moved; ${plural(d.statuses.filter((x) => x.worse).length, "status", "statuses")} worse.`);
  return out;
}
