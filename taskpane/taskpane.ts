/**
 * The side pane (first version): function guide and cautions. Builds the page with DOM
 * calls only (textContent), so no workbook or catalogue text is ever parsed as HTML.
 */
import { CATALOG } from "../functions/catalog";
import type { FunctionSpec } from "../functions/catalog/types";
import { describeArguments, exampleFormula, searchCatalog, signature } from "./guide";

function el<K extends keyof HTMLElementTagNameMap>(tag: K, text?: string, className?: string): HTMLElementTagNameMap[K] {
  const node = document.createElement(tag);
  if (text !== undefined) node.textContent = text;
  if (className) node.className = className;
  return node;
}

let inExcel = false;

async function insertFormula(formula: string, status: HTMLElement): Promise<void> {
  if (!inExcel) {
    status.textContent = "Open this pane in Excel to insert into the selected cell.";
    return;
  }
  await Excel.run(async (context) => {
    const cell = context.workbook.getActiveCell();
    cell.formulas = [[formula]];
    await context.sync();
  });
  status.textContent = "Inserted into the selected cell.";
}

function showFunction(spec: FunctionSpec, target: HTMLElement): void {
  target.replaceChildren();
  target.append(el("h2", signature(spec)), el("p", spec.purpose));
  const table = el("table");
  for (const a of describeArguments(spec)) {
    const row = el("tr");
    row.append(el("th", a.name), el("td", a.reads), el("td", a.meaning));
    table.append(row);
  }
  target.append(el("h3", "Arguments"), table);
  target.append(el("h3", "Result"), el("p", spec.result.description));
  target.append(el("h3", "Equation"), el("code", spec.equation, "equation"));
  if (spec.assumptions.length) {
    const list = el("ul");
    spec.assumptions.forEach((a) => list.append(el("li", a)));
    target.append(el("h3", "Assumptions"), list);
  }
  const example = exampleFormula(spec);
  if (example) {
    const status = el("p", "", "status");
    const button = el("button", "Insert example into selected cell");
    button.addEventListener("click", () => void insertFormula(example, status).catch((e: Error) => (status.textContent = e.message)));
    target.append(el("h3", "Example"), el("code", example), button, status);
  }
  const sources = el("ul");
  spec.sources.forEach((s) => sources.append(el("li", s)));
  target.append(el("h3", "Sources"), sources);
}

function start(): void {
  const search = document.getElementById("search") as HTMLInputElement;
  const list = document.getElementById("results") as HTMLElement;
  const detail = document.getElementById("detail") as HTMLElement;
  const render = () => {
    list.replaceChildren();
    for (const spec of searchCatalog(CATALOG, search.value)) {
      const item = el("li");
      const button = el("button", `NAPPE.${spec.id}`, "fn");
      button.title = spec.purpose;
      button.addEventListener("click", () => showFunction(spec, detail));
      item.append(button, el("span", spec.purpose, "purpose"));
      list.append(item);
    }
  };
  search.addEventListener("input", render);
  render();
}

if (typeof Office !== "undefined" && Office.onReady) {
  Office.onReady((info) => {
    inExcel = info.host === Office.HostType.Excel;
    start();
  });
} else {
  document.addEventListener("DOMContentLoaded", start);
}
