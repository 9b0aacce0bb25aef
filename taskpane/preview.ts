/**
 * The preview page: the pane beside a read-only grid of a workbook served by `npm run preview`,
 * over the in-memory adapter, so anyone can try the pane without Excel. Clicking a cell selects
 * it. Loads nothing but this page's own files and /workbook.json.
 */
import { addressOf, type CellModel, cellKey, type DefinedName, parseAddress, type WorkbookModel } from "../workbook/model";
import { formulaLibraryReady } from "../workbook/formulaLibrary";
import { formatValue } from "../workbook/format";
import { MemoryHost } from "./host/memory";
import { el, mountPane } from "./ui";
import { workbookTab } from "./workbookTab";
import { displayFormula, hasNappeCall } from "../workbook/storedForm";

interface WorkbookJson {
  name: string;
  names?: DefinedName[];
  sheets: { name: string; cells: CellModel[] }[];
}

function toModel(json: WorkbookJson): WorkbookModel {
  return { name: json.name, names: json.names, sheets: json.sheets.map((s) => ({ name: s.name, cells: new Map(s.cells.map((c) => [cellKey(c.row, c.col), c])) })) };
}

function drawGrid(host: MemoryHost, target: HTMLElement, tabs: HTMLElement, formulaBar: HTMLElement, state: { sheet: string }): void {
  const wb = host.workbook;
  tabs.replaceChildren(
    ...wb.sheets.map((s) => {
      const b = el("button", "sheet-tab", s.name);
      b.setAttribute("aria-selected", String(s.name === state.sheet));
      b.addEventListener("click", () => {
        state.sheet = s.name;
        drawGrid(host, target, tabs, formulaBar, state);
      });
      return b;
    }),
  );
  const sheet = wb.sheets.find((s) => s.name === state.sheet) ?? wb.sheets[0];
  let maxRow = 1;
  let maxCol = 1;
  for (const c of sheet.cells.values()) {
    maxRow = Math.max(maxRow, c.row);
    maxCol = Math.max(maxCol, c.col);
  }
  const table = el("table", "grid");
  table.setAttribute("aria-label", `Sheet ${sheet.name}`);
  const head = el("tr", "", el("th", "corner", ""));
  for (let c = 1; c <= maxCol; c++) head.append(el("th", "col", addressOf(1, c).replace(/\d+$/, "")));
  table.append(head);
  void host.selection().then((sel) => {
    for (let r = 1; r <= maxRow; r++) {
      const tr = el("tr", "", el("th", "row", String(r)));
      for (let c = 1; c <= maxCol; c++) {
        const cell = sheet.cells.get(cellKey(r, c));
        const address = addressOf(r, c);
        const td = el("td", cell?.formula ? (hasNappeCall(cell.formula) ? "nappe" : "formula") : typeof cell?.value === "number" ? "number" : "", cell ? formatValue(cell.value) : "");
        td.tabIndex = 0;
        td.dataset.address = address;
        if (sel.sheet === sheet.name && sel.address === address) td.classList.add("selected");
        const choose = () => host.setSelection(sheet.name, address);
        td.addEventListener("click", choose);
        td.addEventListener("keydown", (e) => {
          const moves: Record<string, [number, number]> = { ArrowUp: [-1, 0], ArrowDown: [1, 0], ArrowLeft: [0, -1], ArrowRight: [0, 1] };
          if (e.key === "Enter" || e.key === " ") {
            e.preventDefault();
            choose();
          } else if (moves[e.key]) {
            e.preventDefault();
            const [dr, dc] = moves[e.key];
            const r2 = Math.min(Math.max(r + dr, 1), maxRow);
            const c2 = Math.min(Math.max(c + dc, 1), maxCol);
            host.setSelection(sheet.name, addressOf(r2, c2));
          }
        });
        tr.append(td);
      }
      table.append(tr);
    }
    target.replaceChildren(table);
    showSelection(host, target, formulaBar);
  });
}

/** Marks the selected cell in the grid and shows its formula or value in the formula bar. */
function showSelection(host: MemoryHost, target: HTMLElement, formulaBar: HTMLElement): void {
  void host.selection().then((sel) => {
    target.querySelectorAll("td.selected").forEach((x) => x.classList.remove("selected"));
    const td = target.querySelector<HTMLElement>(`td[data-address="${sel.address}"]`);
    td?.classList.add("selected");
    td?.focus({ preventScroll: false });
    const { row, col } = parseAddress(sel.address);
    const cell = host.workbook.sheets.find((s) => s.name === sel.sheet)?.cells.get(cellKey(row, col));
    formulaBar.textContent = cell?.formula ? `${sel.sheet}!${sel.address}  =${displayFormula(cell.formula)}` : `${sel.sheet}!${sel.address}  ${cell ? formatValue(cell.value) : ""}`;
  });
}

async function start(): Promise<void> {
  // The in-memory host recalculates the workbook as it is made: the formula library first.
  const [response] = await Promise.all([fetch("workbook.json"), formulaLibraryReady()]);
  const json = (await response.json()) as WorkbookJson;
  const host = new MemoryHost(toModel(json));
  const state = { sheet: host.workbook.sheets[0]?.name ?? "" };
  const gridRoot = document.getElementById("grid")!;
  const tabs = document.getElementById("sheet-tabs")!;
  const bar = document.getElementById("formula-bar")!;
  document.getElementById("book-name")!.textContent = json.name;
  // ?pane=350 sets the pane's width, as Excel gives it (about 280 to 420 px), for looking and for the browser tests;
  // ?cell=Calc!B9 selects a cell once the page is drawn.
  const query = new URLSearchParams(location.search);
  const width = Number(query.get("pane"));
  if (Number.isInteger(width) && width >= 200 && width <= 1000) document.getElementById("app")!.style.width = `${width}px`;
  host.onSelectionChanged(() => {
    void host.selection().then((sel) => {
      if (sel.sheet !== state.sheet) {
        state.sheet = sel.sheet;
        drawGrid(host, gridRoot, tabs, bar, state);
      } else showSelection(host, gridRoot, bar);
    });
  });
  host.onChanged(() => drawGrid(host, gridRoot, tabs, bar, state));
  drawGrid(host, gridRoot, tabs, bar, state);
  mountPane(document.getElementById("app")!, host, [workbookTab]);
  const start = /^(.+)!\$?([A-Za-z]{1,3})\$?(\d+)$/.exec(query.get("cell") ?? "");
  if (start && host.workbook.sheets.some((s) => s.name === start[1])) void host.select(start[1], `${start[2].toUpperCase()}${start[3]}`);
}

void start();
