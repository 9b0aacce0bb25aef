/** The pane's "Workbook" tab: check every NAPPE formula, jump to a cell, write the audit sheet. */
import type { PaneContext } from "./ui";
import { el, MARK } from "./ui";
import { AUDIT_SHEET, checkWorkbook, type WorkbookCheck, writeAuditSheet } from "./workbookCheck";

function build(ctx: PaneContext): HTMLElement {
  const view = el("div", "workbook");
  const run = el("button", "action", "Check the whole workbook");
  const write = el("button", "action", `Write the "${AUDIT_SHEET}" sheet`);
  write.disabled = true;
  const progress = el("progress");
  progress.hidden = true;
  const counts = el("p", "counts");
  const list = el("ul", "results check-list");
  list.setAttribute("aria-label", "NAPPE formulas");
  let last: WorkbookCheck | undefined;

  run.addEventListener("click", async () => {
    run.disabled = true;
    progress.hidden = false;
    list.replaceChildren();
    counts.textContent = "Checking…";
    try {
      last = await checkWorkbook(ctx.port, (done, total) => {
        progress.max = total;
        progress.value = done;
        counts.textContent = `Checking ${done} of ${total}…`;
      });
      counts.replaceChildren(
        el("span", "", `${last.found.split(/(?<=\)): /)[0]}:`),
        el("span", "status ok", `${MARK.ok} ${last.counts.ok} ok`),
        el("span", "status warning", `${MARK.warning} ${last.counts.warning} warning`),
        el("span", "status error", `${MARK.error} ${last.counts.error} error`),
      );
      for (const row of last.rows) {
        const go = el("button", "fn", `${row.sheet}!${row.address}`);
        go.addEventListener("click", () => void ctx.port.select(row.sheet, row.address));
        list.append(el("li", `check-row ${row.status}`, el("span", `status ${row.status}`, `${MARK[row.status]} ${row.status}`), go, el("code", "", row.formula), row.note ? el("span", "purpose", row.note) : ""));
      }
      write.disabled = false;
    } catch (e) {
      counts.textContent = `The check stopped: ${e instanceof Error ? e.message : String(e)}`;
    } finally {
      run.disabled = false;
      progress.hidden = true;
    }
  });

  write.addEventListener("click", async () => {
    if (!last) return;
    write.disabled = true;
    try {
      const report = await writeAuditSheet(ctx.port, last);
      ctx.say(`Wrote the "${AUDIT_SHEET}" sheet: ${report.entries.length} formulas.`);
    } catch (e) {
      ctx.say(`Could not write the audit sheet: ${e instanceof Error ? e.message : String(e)}`);
    } finally {
      write.disabled = false;
    }
  });

  view.append(el("p", "", "Every NAPPE formula in every sheet, with its status. Select one to go to it."), run, " ", write, progress, counts, list);
  return view;
}

export const workbookTab = { name: "Workbook", build };
