/**
 * After a unit fix, the other places that read the same input (pure: through the HostPort):
 * NAPPE arguments that name the input cell, and cells of the tables NAPPE calls read that copy
 * it (=Inputs!B14 under a "Length (m)" header). Each comes with its fixed formula, the input
 * joined with its unit, so the pane can fix them all and the workbook never uses one input in
 * two units.
 */
import { addressOf, parseAddress, splitReference } from "../workbook/address";
import { formulaLibraryReady } from "../workbook/formulaLibrary";
import { callSites, evaluationOrder, replaceArgument } from "../workbook/formula";
import { displayFormula } from "../workbook/storedForm";
import type { HostPort } from "./host/port";

interface SameInputFix {
  sheet: string;
  address: string;
  formula: string;
  /** The formula with every mention of the input joined with its unit. */
  fixed: string;
}

const PLAIN_REFERENCE = /^((?:'(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_.]*)!)?\$?([A-Za-z]{1,3})\$?(\d+)$/;

/** The cell a piece of formula text names, when it is a plain reference. */
function cellNamed(text: string, here: string): string | undefined {
  const m = PLAIN_REFERENCE.exec(text.trim());
  if (!m) return undefined;
  const { sheet, address } = splitReference(`${m[1] ?? ""}${m[2]}${m[3]}`, here);
  return `${sheet}!${address.toUpperCase()}`;
}

/** Every other place reading `input` ("Inputs!B14") as a bare number, with its fix joining `unit`. */
export async function sameInputFixes(port: HostPort, input: { sheet: string; address: string }, unit: string, except: { sheet: string; address: string }): Promise<SameInputFix[]> {
  await formulaLibraryReady();
  const target = `${input.sheet}!${input.address.toUpperCase()}`;
  const out: SameInputFix[] = [];
  const seen = new Set<string>([`${except.sheet}!${except.address}`]);
  for (const cell of await port.nappeFormulaCells()) {
    let sites;
    try {
      sites = evaluationOrder(callSites(cell.formula));
    } catch {
      continue;
    }
    const args = sites.filter((s) => s.name.startsWith("NAPPE.")).flatMap((s) => s.args);
    // Arguments naming the input, fixed from the last to the first so offsets stay right.
    const hits = args.filter((a) => cellNamed(a.text, cell.sheet) === target).sort((a, b) => b.start - a.start);
    const key = `${cell.sheet}!${cell.address}`;
    if (hits.length && !seen.has(key)) {
      seen.add(key);
      const fixed = hits.reduce((f, a) => replaceArgument(f, a, `${a.text}&" ${unit}"`), cell.formula);
      out.push({ sheet: cell.sheet, address: cell.address, formula: displayFormula(cell.formula), fixed: displayFormula(fixed) });
    }
    // Table ranges the call reads: their cells that copy the input.
    for (const a of args) {
      const m = /^((?:'(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_.]*)!)?\$?([A-Za-z]{1,3}\$?\d+):\$?([A-Za-z]{1,3}\$?\d+)$/.exec(a.text.trim());
      if (!m) continue;
      const sheet = m[1] ? splitReference(`${m[1]}A1`, cell.sheet).sheet : cell.sheet;
      const from = parseAddress(m[2]);
      const to = parseAddress(m[3]);
      if ((to.row - from.row + 1) * (to.col - from.col + 1) > 2000) continue;
      const rows = await port.range(sheet, `${addressOf(from.row, from.col)}:${addressOf(to.row, to.col)}`);
      rows.forEach((row, i) =>
        row.forEach((c, j) => {
          const address = addressOf(from.row + i, from.col + j);
          const where = `${sheet}!${address}`;
          if (!c.formula || seen.has(where) || cellNamed(c.formula, sheet) !== target) return;
          seen.add(where);
          out.push({ sheet, address, formula: displayFormula(c.formula), fixed: `${c.formula.trim()}&" ${unit}"` });
        }),
      );
    }
  }
  return out;
}

/**
 * The label cell near `input` whose text is `text`: to the left on the same row (up to three
 * cells, the nearest first), then the cell above, as the unit check reads labels. Two reads.
 */
export async function labelCell(port: HostPort, input: { sheet: string; address: string }, text: string): Promise<{ sheet: string; address: string } | undefined> {
  const { row, col } = parseAddress(input.address);
  if (col > 1) {
    const first = Math.max(1, col - 3);
    const left = (await port.range(input.sheet, `${addressOf(row, first)}:${addressOf(row, col - 1)}`))[0];
    for (let j = left.length - 1; j >= 0; j--) {
      const v = left[j].value;
      if (typeof v !== "string" || !v.trim()) continue;
      if (v === text && !left[j].formula) return { sheet: input.sheet, address: addressOf(row, first + j) };
      break;
    }
  }
  if (row > 1) {
    const above = await port.cell(input.sheet, addressOf(row - 1, col));
    if (above.value === text && !above.formula) return { sheet: input.sheet, address: addressOf(row - 1, col) };
  }
  return undefined;
}
