/**
 * A workbook as it reads once a unit slip is put right, to say what the numbers become: a constant
 * input whose label declares a unit ("Suction pipe length (ft)") but whose bare number formulas
 * read in another (m) is read as labelled: every formula that reads the cell as a bare number
 * reads it times the unit's factor instead. References already joined with a unit
 * (`Inputs!B14&" ft"`) are left as they are. Pure: the workbook given is not changed.
 */
import { lex } from "./formula/lexer";
import { parseAddress, type WorkbookModel } from "./model";

export function readAsLabelled(wb: WorkbookModel, input: { sheet: string; address: string }, factor: number): WorkbookModel {
  const target = parseAddress(input.address);
  const sheets = wb.sheets.map((sheet) => {
    const cells = new Map(sheet.cells);
    for (const [key, cell] of sheet.cells) {
      if (!cell.formula) continue;
      let tokens;
      try {
        tokens = lex(cell.formula);
      } catch {
        continue;
      }
      const edits: { start: number; end: number }[] = [];
      tokens.forEach((t, i) => {
        if (t.type !== "Cell") return;
        const prev = tokens[i - 1];
        const named = prev?.type === "Sheet" && prev.end === t.start ? cell.formula!.slice(prev.start, prev.end - 1).replace(/^'(.*)'$/, "$1").replace(/''/g, "'") : undefined;
        if ((named ?? cell.sheet).toLowerCase() !== input.sheet.toLowerCase()) return;
        const at = parseAddress(cell.formula!.slice(t.start, t.end));
        if (at.row !== target.row || at.col !== target.col) return;
        const next = tokens[i + 1];
        if (next?.type === "Op" && cell.formula!.slice(next.start, next.end) === "&") return;
        if (next?.type === "Colon" || tokens[i - (named ? 2 : 1)]?.type === "Colon") return;
        edits.push({ start: named ? prev.start : t.start, end: t.end });
      });
      if (!edits.length) continue;
      let text = cell.formula;
      for (const e of edits.reverse()) text = `${text.slice(0, e.start)}(${text.slice(e.start, e.end)}*${factor})${text.slice(e.end)}`;
      cells.set(key, { ...cell, formula: text });
    }
    return { ...sheet, cells };
  });
  return { ...wb, sheets };
}
