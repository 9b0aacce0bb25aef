/**
 * The pane's user interface for any HostPort: the selected cell explained, the function guide,
 * and the cautions, always in view. Built with DOM calls only (textContent, never HTML strings),
 * so workbook text can never become markup. Equations are rendered by KaTeX as MathML.
 */
import { CATALOG } from "../functions/catalog";
import type { FunctionSpec } from "../functions/catalog/types";
import { type CallExplanation, type CellExplanation, explainCell } from "./explain";
import { describeArguments, exampleFormula, searchCatalog, signature } from "./guide";
import type { HostPort } from "./host/port";
import { writeAction } from "./actions";
import { GENERAL_CAUTIONS } from "../functions/catalog/_shared";
import { formatNumber, formatUnit, setSignificantFigures, significantFigures } from "../workbook/format";
import { UndoStack } from "./undo";
import { addressOf, parseAddress } from "../workbook/address";
import { derivationText } from "../workbook/derivation";
import { displayFormula } from "../workbook/storedForm";
import { labelCell, sameInputFixes } from "./sameInput";

const CAUTION_TEXT = GENERAL_CAUTIONS.join(" ");

type Child = Node | string;

/** Creates an element with optional class and children (strings become text nodes). */
export function el<K extends keyof HTMLElementTagNameMap>(tag: K, className?: string, ...children: Child[]): HTMLElementTagNameMap[K] {
  const node = document.createElement(tag);
  if (className) node.className = className;
  for (const c of children) node.append(typeof c === "string" ? document.createTextNode(c) : c);
  return node;
}

/** KaTeX, loaded the first time an equation is shown (its own chunk, katex.chunk.js): the pane's first load is smaller without it. */
let katexLoading: Promise<typeof import("katex").default> | undefined;

function equation(tex: string): HTMLElement {
  const box = el("div", "equation");
  // A long equation scrolls inside its box, never the pane; the box takes focus so the keyboard can scroll it.
  box.tabIndex = 0;
  box.setAttribute("role", "group");
  box.setAttribute("aria-label", "Equation (scrolls sideways when wider than the pane)");
  box.setAttribute("aria-busy", "true");
  katexLoading ??= import(/* webpackChunkName: "katex" */ "katex").then((m) => m.default);
  katexLoading
    .then((katex) => katex.render(tex, box, { output: "mathml", displayMode: true, throwOnError: false }))
    .catch(() => (box.textContent = tex))
    .finally(() => box.removeAttribute("aria-busy"));
  return box;
}

/** A table cell that, in the stacked layout of a narrow pane, shows its column's name before it. */
function labelled(td: HTMLTableCellElement, column: string): HTMLTableCellElement {
  td.dataset.label = column;
  return td;
}

/** A spilled result as a small table: its header row with units, then its rows. */
function spillTableView(t: { header: string[]; rows: string[][] }): HTMLElement {
  const table = el("table", "spill");
  table.append(el("caption", "", "Spilled result"));
  table.append(el("tr", "", ...t.header.map((h) => el("th", "", h))));
  for (const r of t.rows) table.append(el("tr", "", ...r.map((c) => el("td", "", c))));
  const wrap = el("div", "table-wrap", table);
  wrap.tabIndex = 0;
  wrap.setAttribute("role", "group");
  wrap.setAttribute("aria-label", "Spilled result (scrolls sideways when wider than the pane)");
  return wrap;
}

function list(title: string, items: readonly string[], className = ""): HTMLElement | string {
  if (!items.length) return "";
  const ul = el("ul", className);
  for (const i of items) ul.append(el("li", "", i));
  return el("div", "block", el("h4", "", title), ul);
}

function collapsible(title: string, items: readonly string[]): HTMLElement | string {
  if (!items.length) return "";
  const details = el("details", "more", el("summary", "", title));
  const ul = el("ul");
  for (const i of items) ul.append(el("li", "", i));
  details.append(ul);
  return details;
}

export interface PaneContext {
  port: HostPort;
  /** Shows a short status line. */
  say(text: string): void;
  /** Shows (or, with null, clears) a box above the cell view that stays until the selection changes. */
  notice(content: HTMLElement | null): void;
  /** The pane's writes, remembered so that "Undo" can put the cells back. */
  undo: UndoStack;
  /** After the next drawing of the cell view, brings what changed into view (a fix's new value and its follow-up offer). */
  showChangeNext(): void;
}

/** Status words with a mark, so colour is never the only signal. */
export const MARK = { ok: "✓", warning: "⚠", error: "✕" } as const;

/**
 * Asks inside the pane (browser dialogs are not available in Office panes): a small box after
 * `anchor` says what will happen, with a button to go ahead and one to cancel. Resolves true to go ahead.
 */
function askInPane(anchor: HTMLElement, message: string, goAhead: string): Promise<boolean> {
  anchor.parentElement?.querySelector(":scope > .ask")?.remove();
  return new Promise((resolve) => {
    const text = el("p", "", message);
    text.id = `ask-${Math.random().toString(36).slice(2)}`;
    const yes = el("button", "action danger", goAhead);
    const no = el("button", "action", "Cancel");
    const box = el("div", "status warning ask", text, yes, " ", no);
    box.setAttribute("role", "alertdialog");
    box.setAttribute("aria-describedby", text.id);
    box.setAttribute("aria-label", "Confirm");
    const done = (answer: boolean) => {
      box.remove();
      anchor.focus();
      resolve(answer);
    };
    yes.addEventListener("click", () => done(true));
    no.addEventListener("click", () => done(false));
    box.addEventListener("keydown", (e) => {
      if (e.key === "Escape") done(false);
    });
    anchor.after(box);
    no.focus();
  });
}

/** Units written with carets ("m^3/h") typeset ("m³/h") inside a text read back to the user. */
function typeset(text: string): string {
  return text.replace(/[A-Za-zµ°]+\^\(?-?\d+\)?(?:\/[A-Za-zµ°]+(?:\^\(?-?\d+\)?)?)*/g, (unit) => formatUnit(unit));
}

function callCard(call: CallExplanation, cell: CellExplanation, ctx: PaneContext, refresh: () => void, tableShown = false): HTMLElement {
  const card = el("section", "call");
  card.append(el("h3", "", `NAPPE.${call.id}`), el("p", "purpose", call.purpose), el("code", "formula", call.text), equation(call.equation));
  if (call.substituted) card.append(el("p", "substituted", call.substituted));
  const table = el("table", "args stackable");
  table.append(el("tr", "", el("th", "", "argument, as written"), el("th", "", "read as: unit and why"), el("th", "", "base value")));
  for (const a of call.args) {
    table.append(
      el(
        "tr",
        "",
        labelled(el("td", "", el("span", "name", a.name), el("br"), el("code", "written", a.written || "(left out)")), "argument"),
        labelled(el("td", "", el("span", "read", typeset(a.value)), el("br"), el("span", "why", a.unit ? `${typeset(a.unit)} · ${a.why}` : a.why)), "read as"),
        labelled(el("td", "base", typeset(a.base)), "base value"),
      ),
    );
  }
  card.append(el("div", "table-wrap", table));
  if (call.steps.length) {
    const steps = el("table", "steps stackable");
    steps.append(el("tr", "", el("th", "", "intermediate value"), el("th", "", "what and how")));
    for (const s of call.steps) steps.append(el("tr", "", labelled(el("td", "", el("strong", "", s.symbol), ` = ${s.value}`), "value"), labelled(el("td", "", el("span", "", s.name), el("br"), el("span", "why", s.how)), "what and how")));
    card.append(el("div", "table-wrap", steps));
  }
  if (call.error) card.append(el("p", "status error", `${MARK.error} ${call.error}`));
  else card.append(el("p", "result", "Result: ", el("strong", "", call.result ?? ""), call.resultBase && call.resultBase !== call.result ? ` (${call.resultBase} in base units)` : ""));
  if (!call.error && call.table && !tableShown) card.append(spillTableView(call.table));
  for (const w of call.unitWarnings) {
    const box = el("div", "status warning unit-warning", el("p", "", `${MARK.warning} Unit check: ${w.message}`));
    if (w.fixedFormula) {
      const button = el("button", "fix", `Use ${w.fixLabel}`);
      const where = `${cell.sheet}!${cell.address}`;
      button.addEventListener("click", () =>
        writeAction(ctx, `join the unit in ${where}`, async () => {
          await ctx.undo.write(`join the unit in ${where}`, [cell], () => ctx.port.setFormula(cell.sheet, cell.address, w.fixedFormula!));
          ctx.say(`Joined the unit in ${where}. Undo puts the formula back.`);
          if (w.input) ctx.notice(await sameInputNotice(ctx, w.input, cell, refresh, w.label));
          ctx.showChangeNext();
          refresh();
        }),
      );
      box.append(button);
    }
    if (w.label) {
      const label = w.label;
      const relabel = el("button", "relabel", `Relabel as "${label.corrected}"`);
      relabel.addEventListener("click", () => writeAction(ctx, `correct the label of ${label.sheet}!${label.address}`, () => correctLabel(ctx, label, refresh)));
      box.append(relabel);
    }
    card.append(box);
  }
  card.append(list("Cross-check", call.diagnosis, "warnings diagnosis"));
  card.append(list("Warnings", call.warnings, "warnings"));
  card.append(el("div", `checks ${call.warnings.length || call.unitWarnings.length ? "warn" : "ok"}`, el("h4", "", call.warnings.length || call.unitWarnings.length ? `${MARK.warning} Checks: see the warnings` : `${MARK.ok} Checks: all passed`), ...call.checks.map((c) => el("p", "check", c))));
  card.append(list("Assumptions", call.assumptions));
  card.append(list("Cautions", call.cautions, "cautions"));
  card.append(collapsible("Sources", call.sources));
  return card;
}

/**
 * After a fix: the other formulas reading the same input, with "Fix all" so the input is read in
 * one unit everywhere, or, the other way round, the label corrected and the fix undone.
 */
async function sameInputNotice(ctx: PaneContext, input: { sheet: string; address: string; unit: string }, cell: CellExplanation, refresh: () => void, label?: CallExplanation["unitWarnings"][number]["label"]): Promise<HTMLElement | null> {
  const fixes = await sameInputFixes(ctx.port, input, input.unit, cell);
  if (!fixes.length && !label) return null;
  const where = `${input.sheet}!${input.address}`;
  const box = el("section", "status warning same-input");
  if (fixes.length) {
    const items = el("ul", "");
    for (const f of fixes) items.append(el("li", "", el("strong", "", `${f.sheet}!${f.address}`), " ", el("code", "", `=${f.formula}`), " → ", el("code", "", `=${f.fixed}`)));
    const all = el("button", "fix-all", `Fix all ${fixes.length}`);
    all.addEventListener("click", () =>
      writeAction(ctx, "fix them all", async () => {
        await ctx.undo.write(`join " ${input.unit}" in ${fixes.length} formulas`, fixes, async () => {
          for (const f of fixes) await ctx.port.setFormula(f.sheet, f.address, f.fixed);
        });
        ctx.say(`Joined " ${input.unit}" to ${where} in ${fixes.length} more ${fixes.length === 1 ? "formula" : "formulas"}.`);
        ctx.notice(null);
        refresh();
      }),
    );
    box.append(el("p", "", `${fixes.length} other ${fixes.length === 1 ? "formula reads" : "formulas read"} ${where} as a bare number too:`), items, all);
  } else box.append(el("p", "", `No other formula reads ${where}.`));
  if (label && cell.formula) {
    // The other way round: the number was in the base unit all along. Undo the fix, correct the label.
    const before = cell.formula;
    const instead = el("button", "relabel", "Correct the label instead");
    instead.addEventListener("click", () =>
      writeAction(ctx, `correct the label of ${where}`, async () => {
        await ctx.undo.write(`put back =${before} in ${cell.sheet}!${cell.address}`, [cell], () => ctx.port.setFormula(cell.sheet, cell.address, before));
        ctx.notice(null);
        await correctLabel(ctx, label, refresh, ` and put back =${before} in ${cell.sheet}!${cell.address}`);
      }),
    );
    box.append(el("p", "", `Or, if the number in ${where} is right as read, correct its label instead: "${label.text}" becomes "${label.corrected}", and the fix above is undone.`), instead);
  }
  return box;
}

/** Writes the corrected label text over the label cell of the input, after finding that cell again. */
async function correctLabel(ctx: PaneContext, label: NonNullable<CallExplanation["unitWarnings"][number]["label"]>, refresh: () => void, also = ""): Promise<void> {
  const at = await labelCell(ctx.port, label, label.text);
  if (!at) throw new Error(`the label "${label.text}" is no longer next to ${label.sheet}!${label.address}`);
  await ctx.undo.write(`relabel ${at.sheet}!${at.address}`, [at], () => ctx.port.setValue(at.sheet, at.address, label.corrected));
  ctx.say(`Relabelled ${at.sheet}!${at.address} "${label.corrected}"${also}.`);
  refresh();
}

/** The cross-check of a plain (hand) formula: pick the quantity, see the diagnosis, point arguments at cells by hand, keep the check. */
function crossCheckView(cell: CellExplanation, ctx: PaneContext): HTMLElement {
  const box = el("section", "cross-check");
  box.append(el("h3", "", "Cross-check this hand formula"), el("p", "", "Pick the quantity it computes; Nappe reads its inputs from the cells it uses, at any depth (by label, unit and symbol), computes the same and names the first step that departs."));
  const result = el("div", "cross-check-result");
  const tolerance = el("input", "tolerance");
  tolerance.type = "number";
  tolerance.min = "0.01";
  tolerance.max = "50";
  tolerance.step = "0.1";
  tolerance.value = "0.5";
  tolerance.setAttribute("aria-label", "Tolerance, percent");
  const toleranceRow = el("label", "tolerance-row", "Agrees within ", tolerance, " %");
  const numeric = CATALOG.filter((s) => !s.result.spill && s.id !== "CROSSCHECK");
  /** Argument → cell or literal, as the user pointed them: kept while the same quantity is checked. */
  let mapping: Record<string, string> = {};
  let current = "";
  /** The arguments as a small form: each can be pointed at a cell ("Inputs!B3") or given ("20 degC"). */
  const mappingForm = (specId: string, read: { name: string; from: string; how: string; shown: string }[]) => {
    const spec = numeric.find((s) => s.id === specId)!;
    const form = el("form", "mapping");
    const table = el("table", "args");
    table.append(el("tr", "", el("th", "", "argument"), el("th", "", "read from"), el("th", "", "as")));
    const fields = new Map<string, HTMLInputElement>();
    for (const p of spec.params) {
      if (p.kind !== "quantity") continue;
      const r = read.find((x) => x.name === p.name);
      const field = el("input", "map-to");
      field.value = mapping[p.name] ?? (r && (r.how === "label" || r.how === "by hand" || r.how === "workbook") && !r.from.startsWith("water at") ? r.from : "");
      field.placeholder = r?.how === "default" || r?.how === "assumed" ? `assumed: ${r.shown || r.from}` : p.optional ? "default" : "cell such as Inputs!B3";
      field.setAttribute("aria-label", `${p.name}: read from`);
      fields.set(p.name, field);
      table.append(el("tr", r && (r.how === "default" || r.how === "assumed") ? "assumed" : "", el("td", "name", p.name), el("td", "", field), el("td", "why", r ? `${r.shown}${r.how === "label" ? "" : ` (${r.how})`}` : "")));
    }
    const again = el("button", "recheck", "Check again with these cells");
    again.type = "submit";
    form.addEventListener("submit", (e) => {
      e.preventDefault();
      mapping = Object.fromEntries([...fields].map(([k, f]) => [k, f.value.trim()]).filter(([, v]) => v));
      void show(specId);
    });
    form.append(el("div", "table-wrap", table), again);
    return form;
  };
  const show = async (specId: string) => {
    if (specId !== current) mapping = {};
    current = specId;
    result.replaceChildren(el("p", "", "Checking…"));
    try {
      const percent = Number(tolerance.value);
      if (!(percent > 0 && percent < 100)) throw new Error("the tolerance must be a percentage above 0 and below 100");
      // The cross-check loads as a chunk of its own, the first time it is used.
      const { crossCheckCell } = await import(/* webpackChunkName: "crosscheck" */ "./crossCheck");
      const r = await crossCheckCell(ctx.port, cell.sheet, cell.address, specId, { tolerance: percent / 100, mapping });
      const mark = r.verdict === "agrees" ? MARK.ok : MARK.warning;
      const lines = r.lines;
      const verdict = el("p", `status verdict ${r.verdict === "agrees" ? "ok" : "warning"}`, `${mark} ${r.headline}`);
      const keep = el("button", "keep", "Keep the check in the workbook");
      keep.addEventListener("click", () =>
        writeAction(ctx, "keep the check", async () => {
          const { row, col } = parseAddress(cell.address);
          const target = addressOf(row, col + 1);
          const existing = await ctx.port.cell(cell.sheet, target);
          if (existing.formula || (existing.value !== null && existing.value !== "")) {
            ctx.say(`${cell.sheet}!${target} is not empty: copy the check instead: =${r.keepFormula}`);
            return;
          }
          await ctx.undo.write(`keep the check in ${cell.sheet}!${target}`, [{ sheet: cell.sheet, address: target }], () => ctx.port.setFormula(cell.sheet, target, r.keepFormula));
          ctx.say(`Kept the check in ${cell.sheet}!${target}.`);
        }),
      );
      // An incomplete check is never kept: it would bake the assumption into the workbook.
      const incomplete = r.verdict === "incomplete";
      keep.disabled = incomplete;
      const why = incomplete ? el("p", "why", "Give Nappe the missing input above before keeping the check: kept now, it would carry the assumption into the workbook.") : "";
      result.replaceChildren(verdict, list("Diagnosis", lines.slice(1), "warnings diagnosis"), mappingForm(specId, r.inputs), ...(incomplete ? [] : [el("code", "formula", `=${r.keepFormula}`)]), keep, why);
    } catch (e) {
      const message = e instanceof Error ? e.message : String(e);
      result.replaceChildren(el("p", "status error", `${MARK.error} Could not cross-check as NAPPE.${specId}: ${message}`), el("p", "", "Point each argument at the cell that holds it (or type a value with its unit), then check again."), mappingForm(specId, []));
    }
  };
  const picker = functionPicker(numeric, { placeholder: "Quantity: head loss, shaft power, npsh…", label: "Quantity the formula computes", listLabel: "Quantities", most: 6 }, (spec) => void show(spec.id));
  box.append(toleranceRow, picker, result);
  return box;
}

function renderCell(target: HTMLElement, cell: CellExplanation, ctx: PaneContext, refresh: () => void): void {
  target.replaceChildren();
  target.append(el("h2", "cell-address", `${cell.sheet}!${cell.address}`));
  if (cell.formula) target.append(el("code", "formula", `=${cell.formula}`));
  // The answer first: the value, its status and any warning, then a spilled result, the chart, the derivations.
  if (cell.value !== "") target.append(el("p", "value", "Value: ", el("strong", "", cell.value), cell.exact && cell.exact !== cell.value ? el("span", "why", ` (exact ${cell.exact})`) : ""));
  if (cell.message) target.append(el("p", "message", cell.message));
  if (cell.formula && !cell.calls.length && !cell.error) target.append(crossCheckView(cell, ctx));
  if (cell.error) target.append(el("p", "status error", `${MARK.error} ${cell.error}`));
  if (cell.calls.length && !cell.error) target.append(valueStatus(cell, target));
  const last = cell.calls[cell.calls.length - 1];
  const topTable = last && !last.error && last.table ? last : undefined;
  if (topTable?.table) target.append(spillTableView(topTable.table));
  if (cell.chart) {
    // Chart.js loads when a cell first has a chart, not with the pane: a slot of the chart's height waits for it.
    const chart = cell.chart;
    const slot = el("div", "chart-slot");
    target.append(slot);
    import(/* webpackChunkName: "chart" */ "./chart")
      .then(({ drawChart }) => slot.replaceWith(drawChart(chart)))
      .catch((e: unknown) => slot.replaceWith(el("p", "status error", `${MARK.error} Could not draw the chart: ${e instanceof Error ? e.message : String(e)}`)));
  }
  for (const call of cell.calls) target.append(callCard(call, cell, ctx, refresh, call === topTable));
  if (cell.calls.length && cell.formula) target.append(copyAsText(cell, ctx));
}

/** Under the value: its status, and the first warning with a button to the rest (they sit further down, in each call's card). */
function valueStatus(cell: CellExplanation, target: HTMLElement): HTMLElement {
  const warnings = cell.calls.flatMap((c) => [...c.unitWarnings.map((w) => `Unit check: ${w.message}`), ...c.warnings, ...(c.error ? [c.error] : [])]);
  if (!warnings.length) return el("p", "value-status status ok", `${MARK.ok} No warnings: every check passed`);
  const first = warnings[0];
  const short = first.length > 110 ? `${first.slice(0, 108)}…` : first;
  const go = el("button", "show-warnings", warnings.length === 1 ? "Show it" : `Show all ${warnings.length}`);
  go.addEventListener("click", () => target.querySelector(".unit-warning, .warnings, .call .status.error")?.scrollIntoView({ block: "start", behavior: "smooth" }));
  return el("p", "value-status status warning", `${MARK.warning} ${warnings.length === 1 ? "1 warning" : `${warnings.length} warnings`}: ${short} `, go);
}

/** "Copy as text": the derivation of every call in the cell, as a reviewer pastes it into a report. */
function copyAsText(cell: CellExplanation, ctx: PaneContext): HTMLElement {
  const text = cell.calls.map((c) => derivationText({ sheet: cell.sheet, address: cell.address, formula: cell.formula! }, c)).join("\n\n");
  const area = el("textarea", "derivation-text");
  area.value = text;
  area.readOnly = true;
  area.rows = Math.min(20, text.split("\n").length + 1);
  area.setAttribute("aria-label", "Derivation as text");
  const button = el("button", "copy", "Copy as text");
  button.addEventListener("click", async () => {
    try {
      await navigator.clipboard.writeText(text);
      ctx.say("Copied the derivation as text.");
    } catch {
      // Clipboard access can be refused inside an Office pane: the text is there to select.
      area.focus();
      area.select();
      ctx.say("Select the text below and copy it (Ctrl+C).");
    }
  });
  return el("section", "derivation", el("h3", "", "Derivation as text"), button, area);
}

function guideDetail(spec: FunctionSpec, target: HTMLElement, ctx: PaneContext): void {
  target.replaceChildren();
  const title = el("h3", "", signature(spec));
  title.tabIndex = -1;
  target.append(title, el("p", "purpose", spec.purpose), equation(spec.equation));
  // Arguments as a list, not a table: long names ("kinematic_viscosity") never break mid-word at pane width.
  const args = el("dl", "guide-args");
  for (const a of describeArguments(spec)) args.append(el("dt", "", el("code", "", a.name), el("span", "why", ` · ${a.reads}`)), el("dd", "", a.meaning));
  target.append(args, el("p", "", "Result: ", spec.result.description));
  const example = exampleFormula(spec);
  if (example) {
    const button = el("button", "insert", "Insert into the selected cell");
    button.addEventListener("click", () =>
      writeAction(ctx, "insert the example", async () => {
        const sel = await ctx.port.selection();
        const where = `${sel.sheet}!${sel.address}`;
        const now = await ctx.port.cell(sel.sheet, sel.address);
        const held = now.formula ? `the formula =${displayFormula(now.formula)}` : now.value !== null && now.value !== "" ? `the value ${typeof now.value === "number" ? formatNumber(now.value) : `"${String(now.value)}"`}` : "";
        if (held && !(await askInPane(button, `${where} holds ${held}. Replace it with ${example}? Undo can put it back.`, `Replace ${where}`))) {
          ctx.say(`Left ${where} as it was.`);
          return;
        }
        await ctx.undo.write(`insert NAPPE.${spec.id} into ${where}`, [sel], () => ctx.port.setFormula(sel.sheet, sel.address, example.replace(/^=/, "")));
        ctx.say(`Inserted ${example} into ${where}.`);
      }),
    );
    target.append(el("h4", "", "Example"), el("code", "formula", example), button);
  }
  target.append(list("Assumptions", spec.assumptions), list("Cautions", spec.cautions, "cautions"), collapsible("Sources", spec.sources));
  title.focus({ preventScroll: true });
  title.scrollIntoView({ block: "start" });
}

/** A search box over the functions with the matching ones listed as buttons (the guide, the cross-check). */
function functionPicker(specs: readonly FunctionSpec[], text: { placeholder: string; label: string; listLabel: string; most?: number }, pick: (spec: FunctionSpec) => void): HTMLElement {
  const input = el("input", "search");
  input.type = "search";
  input.placeholder = text.placeholder;
  input.setAttribute("aria-label", text.label);
  const results = el("ul", "results");
  results.setAttribute("aria-label", text.listLabel);
  const count = el("p", "result-count");
  count.setAttribute("aria-live", "polite");
  // No inner scroll: the first matches show in the page's own flow, and "Show all" lists the rest.
  const first = text.most ?? 8;
  let all = false;
  const more = el("button", "action more", "");
  more.addEventListener("click", () => {
    all = !all;
    render();
  });
  const render = () => {
    const found = searchCatalog(specs, input.value);
    results.replaceChildren();
    for (const spec of all ? found : found.slice(0, first)) {
      const button = el("button", "fn", `NAPPE.${spec.id}`);
      button.addEventListener("click", () => pick(spec));
      results.append(el("li", "", button, el("span", "purpose", spec.purpose)));
    }
    count.textContent = found.length ? `${found.length} ${found.length === 1 ? "match" : "matches"}` : "No function matches: try another word, such as head, flow or npsh.";
    more.hidden = found.length <= first;
    more.textContent = all ? "Show fewer" : `Show all ${found.length}`;
  };
  input.addEventListener("input", () => {
    all = false;
    render();
  });
  render();
  return el("div", "picker", input, count, results, more);
}

function guideView(ctx: PaneContext): HTMLElement {
  const detail = el("div", "detail");
  const picker = functionPicker(CATALOG, { placeholder: "Search: head loss, npsh, gpm…", label: "Search the functions", listLabel: "Functions" }, (spec) => guideDetail(spec, detail, ctx));
  return el("div", "guide", picker, detail);
}

/** The significant-figures setting, kept between sessions where the pane may store it. */
function figuresSetting(onChange: () => void): HTMLElement {
  const select = el("select", "figures");
  for (const n of [3, 4, 5, 6, 8]) {
    const o = el("option", "", `${n} figures`);
    o.value = String(n);
    select.append(o);
  }
  try {
    const kept = Number(localStorage.getItem("nappe.figures"));
    if (kept) setSignificantFigures(kept);
  } catch {
    // No storage (private mode, a locked-down pane): the default stays.
  }
  select.value = String(significantFigures());
  select.setAttribute("aria-label", "Significant figures shown");
  select.addEventListener("change", () => {
    setSignificantFigures(Number(select.value));
    try {
      localStorage.setItem("nappe.figures", select.value);
    } catch {
      // As above.
    }
    onChange();
  });
  return select;
}

/** A WAI-ARIA tablist: one tab in the Tab order, arrow keys, Home and End move between tabs. */
function tablist(names: readonly string[], panels: readonly HTMLElement[]): { bar: HTMLElement; show(i: number): void } {
  const bar = el("div", "tabs");
  bar.setAttribute("role", "tablist");
  bar.setAttribute("aria-label", "Nappe views");
  const buttons = names.map((name, i) => {
    const b = el("button", "tab", name);
    b.id = `tab-${i}`;
    b.setAttribute("role", "tab");
    b.setAttribute("aria-controls", `panel-${i}`);
    panels[i].id = `panel-${i}`;
    panels[i].setAttribute("role", "tabpanel");
    panels[i].setAttribute("aria-labelledby", b.id);
    panels[i].tabIndex = 0;
    b.addEventListener("click", () => show(i));
    b.addEventListener("keydown", (e) => {
      const to = { ArrowRight: i + 1, ArrowLeft: i - 1, Home: 0, End: names.length - 1 }[e.key];
      if (to === undefined) return;
      e.preventDefault();
      const j = (to + names.length) % names.length;
      show(j);
      buttons[j].focus();
    });
    return b;
  });
  const show = (i: number) => {
    panels.forEach((p, j) => (p.hidden = j !== i));
    buttons.forEach((b, j) => {
      b.setAttribute("aria-selected", String(j === i));
      b.tabIndex = j === i ? 0 : -1;
    });
  };
  bar.append(...buttons);
  return { bar, show };
}

/** Builds the pane inside `root` and keeps it in step with the selection. */
export function mountPane(root: HTMLElement, port: HostPort, extraTabs: { name: string; build: (ctx: PaneContext) => HTMLElement }[] = []): PaneContext {
  const status = el("p", "status-line");
  status.setAttribute("role", "status");
  const noticeArea = el("div", "notice-area");
  const undo = new UndoStack(port);
  let showChange = false;
  const ctx: PaneContext = { port, say: (t) => (status.textContent = t), notice: (content) => noticeArea.replaceChildren(...(content ? [content] : [])), undo, showChangeNext: () => (showChange = true) };
  const undoButton = el("button", "undo", "Undo");
  const showUndo = () => {
    undoButton.disabled = !undo.last;
    undoButton.title = undo.last ? `Undo: ${undo.last}` : "Nothing to undo";
    undoButton.setAttribute("aria-label", undo.last ? `Undo: ${undo.last}` : "Undo (nothing to undo)");
  };
  undo.onChange(showUndo);
  showUndo();
  undoButton.addEventListener("click", () =>
    writeAction(ctx, "undo", async () => {
      const what = await undo.undo();
      if (what) ctx.say(`Undone: ${what}.`);
      void refresh();
    }),
  );
  const cellView = el("div", "cell-view");
  const tabs = [{ name: "This cell", build: () => el("div", "", noticeArea, cellView) }, { name: "Guide", build: () => guideView(ctx) }, ...extraTabs.map((t) => ({ name: t.name, build: () => t.build(ctx) }))];
  const body = el("main", "pane-body");
  const panels = tabs.map((t) => el("div", "panel", t.build()));
  const { bar, show } = tablist(
    tabs.map((t) => t.name),
    panels,
  );
  body.append(...panels);
  show(0);
  const caution = el("footer", "caution", `⚠ ${CAUTION_TEXT}`);
  caution.setAttribute("role", "note");
  const tools = el("div", "tools", undoButton, figuresSetting(() => void refresh()));
  root.replaceChildren(el("header", "pane-header", el("div", "title-row", el("h1", "", "Nappe"), tools), status), bar, body, caution);

  let generation = 0;
  let shown = "";
  const refresh = async () => {
    const mine = ++generation;
    try {
      const sel = await port.selection();
      const explanation = await explainCell(port, sel.sheet, sel.address);
      if (mine !== generation) return;
      renderCell(cellView, explanation, ctx, () => void refresh());
      const here = `${sel.sheet}!${sel.address}`;
      if (showChange) {
        // After a fix: the follow-up offer (Fix all) if there is one, else the new value.
        showChange = false;
        (noticeArea.childElementCount ? noticeArea : cellView.querySelector(".value") ?? cellView).scrollIntoView({ block: "start" });
      } else if (here !== shown) body.scrollTop = 0; // a new cell opens at its top
      shown = here;
    } catch (e) {
      if (mine === generation) cellView.replaceChildren(el("p", "status error", `${MARK.error} Could not read the cell: ${e instanceof Error ? e.message : String(e)}`));
    }
  };
  port.onSelectionChanged(() => {
    ctx.notice(null);
    void refresh();
  });
  void refresh();
  return ctx;
}
