/**
 * Browser tests of the preview page (the pane beside a read-only grid) in Debian's Chromium,
 * driven by playwright-core. Screenshots go to test-output/. Without /usr/bin/chromium these
 * tests are skipped with a loud notice, unless NAPPE_REQUIRE_BROWSER=1 (as .ci/run sets), when
 * they fail instead.
 */
import type { ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import ExcelJS from "exceljs";
import { type Browser, chromium, type Locator, type Page } from "playwright-core";
import { startPreview } from "../scripts/acceptance";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { DEMO_FILE } from "../demo/build";
import { HAND_BOOKS, handBookBytes } from "./fixtures/handSheets";
import { renderHtml } from "../headless/renderHtml";
import { readWorkbook } from "../headless/readXlsx";
import { buildAudit } from "../workbook/audit";
import { labelSource } from "../workbook/model";
import { recalculate } from "../workbook/recalc";

const root = join(__dirname, "..");
const CHROMIUM = "/usr/bin/chromium";
const hasChromium = existsSync(CHROMIUM);
const required = process.env.NAPPE_REQUIRE_BROWSER === "1";
const shots = join(root, "test-output");

if (!hasChromium) {
  const notice = `\n${"!".repeat(78)}\n! BROWSER TESTS SKIPPED: ${CHROMIUM} is missing (apt-get install -y chromium).\n${"!".repeat(78)}\n`;
  if (required) throw new Error(`NAPPE_REQUIRE_BROWSER=1 but ${CHROMIUM} is missing`);
  console.warn(notice);
}

/** Waits until `read` gives a value that passes `check` (Playwright's own matchers are not vitest's). */
async function eventually<T>(read: () => Promise<T>, check: (v: T) => boolean, what: string, ms = 8000): Promise<void> {
  const end = Date.now() + ms;
  let last: T | undefined;
  while (Date.now() < end) {
    last = await read().catch(() => undefined as T);
    if (last !== undefined && check(last)) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`timed out waiting for ${what}; last seen: ${JSON.stringify(last)}`);
}
const containsText = (loc: Locator, text: string) => eventually(() => loc.innerText(), (t) => t.includes(text), `text "${text}"`);
const hasExactText = (loc: Locator, text: string) => eventually(() => loc.innerText(), (t) => t.trim() === text, `exact text "${text}"`);
const countIs = (loc: Locator, n: number) => eventually(() => loc.count(), (c) => c === n, `${n} elements`);

async function selectCell(page: Page, sheet: string, address: string): Promise<void> {
  await page.getByRole("button", { name: sheet, exact: true }).click();
  await page.locator(`td[data-address="${address}"]`).click();
  await page.locator(".cell-address", { hasText: `${sheet}!${address}` }).waitFor();
}

describe.runIf(hasChromium)("preview page in Chromium", () => {
  let browser: Browser;
  let page: Page;
  let preview: { url: string; server: ChildProcess };
  const requests: string[] = [];
  const errors: string[] = [];

  beforeAll(async () => {
    mkdirSync(shots, { recursive: true });
    if (!existsSync(join(root, "dist/preview.html"))) throw new Error("dist/preview.html is missing: run npm run build (npm test does)");
    preview = await startPreview();
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
    });
    page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
    page.on("request", (r) => requests.push(r.url()));
    page.on("pageerror", (e) => errors.push(String(e)));
  }, 60000);

  // Each test starts from a freshly loaded page and workbook: no test depends on another's clicks.
  beforeEach(async () => {
    await page.goto(preview.url);
    await page.locator("table.grid").waitFor();
  });

  afterAll(async () => {
    await browser?.close();
    preview?.server.kill();
  });

  it("explains a NAPPE cell: equation, arguments with their units, result", async () => {
    await selectCell(page, "Calc", "B9");
    // The file stores _xldudf_NAPPE_HEAD(...); people read the dotted form.
    await containsText(page.locator("#formula-bar"), "=NAPPE.HEAD(Inputs!B10, B5, \"m\")");
    const card = page.locator(".call").first();
    await hasExactText(card.locator("h3"), "NAPPE.HEAD");
    // KaTeX is its own chunk, loaded when the first equation is shown.
    await card.locator(".equation math").waitFor();
    expect(await card.locator(".equation math").count()).toBe(1);
    const rows = card.locator("table.args tr");
    await containsText(rows.nth(1), "Inputs!B10");
    await containsText(rows.nth(1), "4.8 bar");
    await containsText(rows.nth(1), "bar · unit written with the number");
    await containsText(rows.nth(1), "480000 Pa");
    await containsText(card.locator(".result"), "49.13 m"); // 4 significant figures
    await containsText(card.locator(".substituted"), "h = p/(ρg) = 480000 Pa/(996.3 kg/m³·9.80665 m/s²) = 49.13 m");
    expect(await page.locator(".derivation-text").inputValue()).toMatch(/^Calc!B9: =NAPPE\.HEAD\(Inputs!B10, B5, "m"\)\nNAPPE\.HEAD: /);
    await page.screenshot({ path: join(shots, "pane-cell-view.png") });
  });

  it("flags the mislabelled input and applies the one-click fix", async () => {
    await selectCell(page, "Calc", "B21");
    const warning = page.locator(".unit-warning");
    await containsText(warning, 'Inputs!B14 is labelled "Suction pipe length (ft)"');
    await page.screenshot({ path: join(shots, "pane-unit-warning.png") });
    await warning.getByRole("button", { name: 'Use Inputs!B14&" ft"' }).click();
    await containsText(page.locator("code.formula").first(), 'Inputs!B14&" ft"');
    await countIs(page.locator(".unit-warning"), 0);
    await containsText(page.locator(".call table.args"), "30 ft");
    // The same input is read elsewhere: the table cell E4 copies it under "Length (m)".
    const others = page.locator(".same-input");
    await containsText(others, "1 other formula reads Inputs!B14 as a bare number too");
    await containsText(others, 'Calc!E4 =Inputs!B14 → =Inputs!B14&" ft"');
    await page.screenshot({ path: join(shots, "pane-unit-fixed.png") });
    await others.getByRole("button", { name: "Fix all 1" }).click();
    await containsText(page.locator(".status-line"), 'Joined " ft" to Inputs!B14 in 1 more formula');
    await selectCell(page, "Calc", "B25");
    await containsText(page.locator(".call table.args"), "Length (m) → length in m");
    await countIs(page.locator(".unit-warning"), 0);
  });

  it("corrects the label instead: the fix is undone and the input's label says the unit the number is read in", async () => {
    await selectCell(page, "Calc", "B21");
    const warning = page.locator(".unit-warning");
    await containsText(warning.getByRole("button", { name: 'Relabel as "Suction pipe length (m)"' }), "Relabel");
    await warning.getByRole("button", { name: 'Use Inputs!B14&" ft"' }).click();
    const others = page.locator(".same-input");
    await containsText(others, '"Suction pipe length (ft)" becomes "Suction pipe length (m)"');
    await others.getByRole("button", { name: "Correct the label instead" }).click();
    await containsText(page.locator(".status-line"), 'Relabelled Inputs!A14 "Suction pipe length (m)" and put back =NAPPE.HEADLOSS(B11&" m^3/h", B16, Inputs!B14, B18, B6) in Calc!B21');
    await countIs(page.locator(".same-input"), 0);
    await containsText(page.locator("#formula-bar"), "Inputs!B14, B18, B6)");
    await countIs(page.locator(".unit-warning"), 0);
    await containsText(page.locator(".call table.args"), "30 m");
    await page.screenshot({ path: join(shots, "pane-label-corrected.png") });
    await selectCell(page, "Inputs", "A14");
    await containsText(page.locator("#formula-bar"), "Suction pipe length (m)");
  });

  it("finds a function in the guide and inserts it into the selected cell", async () => {
    await selectCell(page, "Calc", "D40");
    await page.getByRole("tab", { name: "Guide" }).click();
    await page.getByRole("searchbox", { name: "Search the functions" }).fill("npsh available");
    await page.getByRole("button", { name: "NAPPE.NPSHA", exact: true }).click();
    await containsText(page.locator(".detail h3").first(), "NAPPE.NPSHA(surface_pressure");
    await page.getByRole("button", { name: "Insert into the selected cell" }).click();
    await containsText(page.locator(".status-line"), "Inserted =NAPPE.NPSHA(");
    await eventually(() => page.locator('td[data-address="D40"]').innerText(), (t) => t.trim() !== "", "a value");
    await page.screenshot({ path: join(shots, "pane-guide-insert.png") });
    await page.getByRole("tab", { name: "This cell" }).click();
  });

  it("checks the whole workbook and goes to a cell from its row", async () => {
    await page.getByRole("tab", { name: "Workbook" }).click();
    await page.getByRole("button", { name: "Check the whole workbook" }).click();
    await containsText(page.locator(".workbook .counts"), "NAPPE formulas");
    const rows = page.locator(".check-row");
    expect(await rows.count()).toBeGreaterThan(25);
    await page.screenshot({ path: join(shots, "pane-workbook-check.png") });
    await page.locator(".check-row").filter({ hasText: "Calc!B36" }).getByRole("button", { name: "Calc!B36" }).click();
    await containsText(page.locator("#formula-bar"), "Calc!B36");
    await eventually(() => page.locator('td[data-address="B36"]').getAttribute("class"), (c) => Boolean(c?.includes("selected")), "B36 selected");
  });

  it("moves the selection with the arrow keys", async () => {
    await page.getByRole("tab", { name: "This cell" }).click();
    await selectCell(page, "Calc", "B9");
    await page.keyboard.press("ArrowDown");
    await page.locator(".cell-address", { hasText: "Calc!B10" }).waitFor();
    await page.keyboard.press("ArrowRight");
    await page.locator(".cell-address", { hasText: "Calc!C10" }).waitFor();
  });

  it("draws the pump and system curves with the operating point for a duty-point cell", async () => {
    // Chart.js arrives late, as on a slow connection: its chunk is held until the slot that keeps
    // its place is on screen. The test must then wait for the drawn chart, not read the slot
    // (CI once did). Held on a condition, not for a time.
    let release: () => void = () => {};
    const slotSeen = new Promise<void>((resolve) => (release = resolve));
    await page.route("**/chart.chunk.js", async (route) => {
      await slotSeen;
      await route.continue();
    });
    await page.goto(preview.url, { waitUntil: "domcontentloaded" });
    await page.getByRole("tab", { name: "This cell" }).click();
    await selectCell(page, "Calc", "B28");
    await page.locator(".cell-view .chart-slot").first().waitFor();
    // While the chunk is held, nothing on the page may pass for the chart.
    expect(await page.locator(".cell-view .chart").count()).toBe(0);
    release();
    const chart = page.locator(".cell-view .chart").first();
    await chart.waitFor();
    await page.unroute("**/chart.chunk.js");
    const op = (await chart.getAttribute("data-operating-point"))!.split(",").map(Number);
    expect(op[0]).toBeCloseTo(87.4559, 3);
    expect(op[1]).toBeCloseTo(102.3, 3);
    expect(await chart.getAttribute("data-series")).toBe("Pump curve (points)|Pump curve|Efficiency|BEP|Preferred region (70–120 % of BEP)|NPSHr|NPSHa (Calc!B36)|System curve|Operating point");
    // Something was drawn in both panels: head and efficiency, then NPSH on a scale of its own.
    // (Playwright runs this pixel count in the page; it is our own function, never workbook text.)
    const ink = (canvas: Locator) =>
      canvas.evaluate((c: HTMLCanvasElement) => {
        const d = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
        let n = 0;
        for (let i = 3; i < d.length; i += 4) if (d[i] > 0) n++;
        return n;
      });
    expect(await ink(chart.locator("canvas"))).toBeGreaterThan(2000);
    const npsh = page.locator(".cell-view .npsh-panel");
    expect(await npsh.getAttribute("aria-label")).toMatch(/^NPSH available and required against flow, on a scale of their own$/);
    expect(await ink(npsh.locator("canvas"))).toBeGreaterThan(1000);
    await chart.scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(shots, "pane-duty-chart.png") });
  });

  it("writes the audit sheet into the in-memory workbook and nothing else", async () => {
    const sheetsBefore = await page.locator("#sheet-tabs button").allInnerTexts();
    await page.getByRole("tab", { name: "Workbook" }).click();
    await page.getByRole("button", { name: "Check the whole workbook" }).click();
    await containsText(page.locator(".workbook .counts"), "NAPPE formulas");
    await page.getByRole("button", { name: 'Write the "Nappe audit" sheet' }).click();
    await containsText(page.locator(".status-line"), 'Wrote the "Nappe audit" sheet');
    await eventually(() => page.locator("#sheet-tabs button").allInnerTexts(), (t) => t.length === sheetsBefore.length + 1 && t.includes("Nappe audit"), "a new audit sheet tab");
    await page.getByRole("button", { name: "Nappe audit", exact: true }).click();
    await containsText(page.locator("table.grid"), "Inputs (as written → as read)");
    await containsText(page.locator("table.grid"), "NAPPE.HEADLOSS");
    await page.screenshot({ path: join(shots, "preview-audit-sheet.png") });
  });

  it("loads nothing from the network, and raises no page error", async () => {
    requests.length = 0;
    errors.length = 0;
    await page.goto(preview.url, { waitUntil: "networkidle" });
    await selectCell(page, "Calc", "B28");
    await page.locator(".cell-view .chart").first().waitFor();
    expect(requests.length).toBeGreaterThan(0);
    expect(requests.filter((u) => !u.startsWith("http://127.0.0.1:"))).toEqual([]);
    expect(errors).toEqual([]);
  });
  it("moves between the tabs with the arrow keys, Home and End (WAI-ARIA tablist), one tab in the Tab order", async () => {
    const tab = (name: string) => page.getByRole("tab", { name });
    await tab("This cell").focus();
    await page.keyboard.press("ArrowRight");
    expect(await tab("Guide").getAttribute("aria-selected")).toBe("true");
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe("Guide");
    await page.keyboard.press("End");
    expect(await tab("Workbook").getAttribute("aria-selected")).toBe("true");
    await page.keyboard.press("ArrowRight"); // wraps round
    expect(await tab("This cell").getAttribute("aria-selected")).toBe("true");
    await page.keyboard.press("ArrowLeft");
    expect(await tab("Workbook").getAttribute("aria-selected")).toBe("true");
    await page.keyboard.press("Home");
    expect(await tab("This cell").getAttribute("aria-selected")).toBe("true");
    expect(await page.locator('[role="tab"][tabindex="0"]').count()).toBe(1);
    await expect(page.locator("#panel-0").isVisible()).resolves.toBe(true);
  });

  it("asks inside the pane before inserting over a formula, says what it replaces, and Undo puts it back", async () => {
    await selectCell(page, "Calc", "B9");
    const undo = page.getByRole("button", { name: /^Undo/ });
    expect(await undo.isDisabled()).toBe(true);
    // Disabled looks disabled: faded and dashed, not only unclickable.
    expect(await undo.evaluate((b) => [getComputedStyle(b).opacity, getComputedStyle(b).borderStyle])).toEqual(["0.55", "dashed"]);
    await page.getByRole("tab", { name: "Guide" }).click();
    await page.getByRole("searchbox", { name: "Search the functions" }).fill("reynolds");
    await page.getByRole("button", { name: "NAPPE.REYNOLDS", exact: true }).click();
    const insert = page.getByRole("button", { name: "Insert into the selected cell" });
    await insert.click();
    const ask = page.getByRole("alertdialog");
    await containsText(ask, 'Calc!B9 holds the formula =NAPPE.HEAD(Inputs!B10, B5, "m"). Replace it with =NAPPE.REYNOLDS(');
    await page.screenshot({ path: join(shots, "pane-insert-asks.png") });
    await ask.getByRole("button", { name: "Cancel" }).click();
    await containsText(page.locator(".status-line"), "Left Calc!B9 as it was.");
    await containsText(page.locator("#formula-bar"), '=NAPPE.HEAD(Inputs!B10, B5, "m")');
    await insert.click();
    await page.getByRole("alertdialog").getByRole("button", { name: "Replace Calc!B9" }).click();
    await containsText(page.locator("#formula-bar"), "=NAPPE.REYNOLDS(");
    expect(await undo.isDisabled()).toBe(false);
    expect(await undo.getAttribute("aria-label")).toBe("Undo: insert NAPPE.REYNOLDS into Calc!B9");
    await undo.click();
    await containsText(page.locator(".status-line"), "Undone: insert NAPPE.REYNOLDS into Calc!B9.");
    await containsText(page.locator("#formula-bar"), '=NAPPE.HEAD(Inputs!B10, B5, "m")');
    await eventually(() => undo.isDisabled(), (d) => d, "Undo disabled again");
  });

  it("undoes a one-click unit fix", async () => {
    await selectCell(page, "Calc", "B21");
    await page.locator(".unit-warning").getByRole("button", { name: 'Use Inputs!B14&" ft"' }).click();
    await containsText(page.locator("#formula-bar"), 'Inputs!B14&" ft"');
    await page.getByRole("button", { name: "Undo: join the unit in Calc!B21" }).click();
    await containsText(page.locator("#formula-bar"), "Inputs!B14, B18, B6)");
    await countIs(page.locator(".unit-warning"), 1);
  });

  it("answers on the first screen at 350 px: value, status and first warning, then the spilled result, then the chart, then the derivation", async () => {
    const context = await browser.newContext({ viewport: { width: 1000, height: 760 } });
    const p = await context.newPage();
    await p.goto(`${preview.url}?pane=350`);
    await p.locator("table.grid").waitFor();
    await selectCell(p, "Calc", "B28");
    await p.locator(".cell-view .chart").first().waitFor();
    // In this order in the cell view.
    const order = await p.evaluate(() => {
      const view = document.querySelector(".cell-view")!;
      const at = (sel: string) => Array.from(view.querySelectorAll("*")).indexOf(view.querySelector(sel)!);
      return { value: at(".value"), status: at(".value-status"), spill: at("table.spill"), chart: at(".chart"), card: at(".call") };
    });
    expect(order.value).toBeLessThan(order.status);
    expect(order.status).toBeLessThan(order.spill);
    expect(order.spill).toBeLessThan(order.chart);
    expect(order.chart).toBeLessThan(order.card);
    // The operating point (flow and head) and the warning's hint are on the first screen of the pane's body.
    const onFirstScreen = await p.evaluate(() => {
      const body = document.querySelector(".pane-body")!.getBoundingClientRect();
      const r = (sel: string) => document.querySelector(".cell-view " + sel)!.getBoundingClientRect();
      return [".value", ".value-status", "table.spill"].map((sel) => [sel, r(sel).bottom <= body.bottom && r(sel).top >= body.top]);
    });
    expect(onFirstScreen).toEqual([[".value", true], [".value-status", true], ["table.spill", true]]);
    await containsText(p.locator(".value-status"), 'Unit check: E4, under "Length (m)"');
    await containsText(p.locator(".cell-view table.spill"), "87.46");
    // The legend is a list under the chart, every curve in it; the plot keeps the chart's height.
    const series = (await p.locator(".cell-view .chart").first().getAttribute("data-series"))!.split("|").filter((n) => !n.endsWith("(points)"));
    const legend = await p.locator(".cell-view .chart-legend").first().locator("li").allInnerTexts();
    expect(legend.filter((t) => series.includes(t.trim())).length).toBe(series.filter((n) => !/^NPSH/.test(n)).length);
    expect((await p.locator(".cell-view .chart canvas").first().boundingBox())!.height).toBeGreaterThanOrEqual(260);
    // The argument table's "read as" and base values typeset units, never with carets (the column "as written" keeps the formula's text).
    const readAs = await p.locator(".cell-view table.args").first().locator(".read, .why, td.base").allInnerTexts();
    expect(readAs.join(" ")).toContain("m³/h");
    expect(readAs.join(" ")).not.toMatch(/\^/);
    await p.locator("#app").screenshot({ path: join(shots, "pane-350-first-screen.png") });
    // Scrolled down, then another cell: it opens at its top.
    await p.evaluate(() => (document.querySelector(".pane-body")!.scrollTop = 2000));
    await selectCell(p, "Calc", "B9");
    await eventually(() => p.evaluate(() => document.querySelector(".pane-body")!.scrollTop), (t) => t === 0, "the pane scrolled to the top");
    // After a one-click fix, the follow-up offer (Fix all) is in view.
    await selectCell(p, "Calc", "B21");
    await p.locator(".unit-warning").getByRole("button", { name: 'Use Inputs!B14&" ft"' }).click();
    await containsText(p.locator(".same-input"), "Fix all");
    await eventually(
      () => p.evaluate(() => {
        const body = document.querySelector(".pane-body")!.getBoundingClientRect();
        const r = document.querySelector(".same-input")!.getBoundingClientRect();
        return r.top >= body.top - 1 && r.top < body.bottom;
      }),
      (inView) => inView,
      "the Fix all offer in view",
    );
    await containsText(p.locator(".cell-view .value"), "0.07804 m"); // 0.256 m × 9.144/30: the 30 ft read as 9.144 m
    // The derivation is worked again with the length read in ft (0.07804 m is 0.2560 ft).
    await containsText(p.locator(".cell-view .call .substituted").first(), "(30 ft/0.5054 ft)");
    await p.locator("#app").screenshot({ path: join(shots, "pane-350-after-fix.png") });
    await context.close();
  });

  it("draws the envelope's chart with a plot at least 200 px tall at 350 px and every curve in its legend", async () => {
    const context = await browser.newContext({ viewport: { width: 1000, height: 760 } });
    const p = await context.newPage();
    await p.goto(`${preview.url}?pane=350`);
    await p.locator("table.grid").waitFor();
    await selectCell(p, "Envelope", "A19");
    const chart = p.locator(".cell-view .chart").first();
    await chart.waitFor();
    expect((await chart.locator("canvas").boundingBox())!.height).toBeGreaterThanOrEqual(260);
    const series = (await chart.getAttribute("data-series"))!.split("|").filter((n) => !n.endsWith("(points)") && !/^NPSH/.test(n));
    const legend = (await p.locator(".cell-view .chart-legend").first().locator("li").allInnerTexts()).map((t) => t.trim());
    for (const name of series) expect(legend, name).toContain(name);
    await p.locator("#app").screenshot({ path: join(shots, "pane-350-envelope-chart.png") });
    await context.close();
  });

  it("shows a spilled result as a labelled table with units, and a single result with its unit", async () => {
    await selectCell(page, "Calc", "B27");
    const spill = page.locator(".cell-view table.spill").first();
    await hasExactText(spill.locator("th").first(), "Impeller");
    await containsText(spill.locator("tr").first(), "Head (m)");
    await containsText(spill.locator("tr").first(), "NPSHr (m)");
    await selectCell(page, "Calc", "B21");
    await containsText(page.locator(".cell-view .value"), " m"); // "Value: 0.256 m", not a bare number
  });

  it("explains a cell inside the pane at Excel's widths: 280, 350 and 420 px, keyboard first", async () => {
    // test-output/pane-{width}-{view}.png for looking; each view is checked for what Excel's narrow pane breaks.
    const axeSource = join(root, "node_modules", "axe-core", "axe.min.js");
    for (const width of [280, 350, 420]) {
      const context = await browser.newContext({ viewport: { width: 1000, height: 760 }, bypassCSP: true }); // axe is injected as a script
      const p = await context.newPage();
      const pageErrors: string[] = [];
      p.on("pageerror", (e) => pageErrors.push(String(e)));
      await p.goto(`${preview.url}?pane=${width}`);
      await p.locator("table.grid").waitFor();
      await p.addScriptTag({ path: axeSource });
      const views: [string, () => Promise<void>][] = [
        ["cell-headloss", () => selectCell(p, "Calc", "B21")],
        ["cell-spill", () => selectCell(p, "Calc", "J3")],
        ["cell-duty", () => selectCell(p, "Calc", "B28")],
        ["cell-envelope", () => selectCell(p, "Envelope", "A19")],
        [
          "guide",
          async () => {
            await p.getByRole("tab", { name: "Guide" }).click();
            await p.getByRole("searchbox", { name: "Search the functions" }).fill("viscosity");
            await p.getByRole("button", { name: "NAPPE.WATER.KINVISC", exact: true }).click();
            await containsText(p.locator(".detail h3"), "NAPPE.WATER.KINVISC(");
          },
        ],
        [
          "workbook",
          async () => {
            await p.getByRole("tab", { name: "Workbook" }).click();
            await p.getByRole("button", { name: "Check the whole workbook" }).click();
            await containsText(p.locator(".counts"), "NAPPE formulas");
          },
        ],
      ];
      for (const [name, open] of views) {
        await open();
        const what = `${width} px, ${name}`;
        // No horizontal overflow of the pane or of its scrolling body.
        const overflow = await p.evaluate(() => {
          const app = document.getElementById("app")!;
          const body = document.querySelector(".pane-body")!;
          return { app: app.scrollWidth - app.clientWidth, body: body.scrollWidth - body.clientWidth };
        });
        expect(overflow, what).toEqual({ app: 0, body: 0 });
        // The screenshot before the keyboard walk below scrolls the view.
        await p.locator("#app").screenshot({ path: join(shots, `pane-${width}-${name}.png`) });
        // Every control reached with Tab is visible, inside the pane, and never under the caution footer.
        const hidden = await p.evaluate(() => {
          const footer = document.querySelector("footer.caution")!.getBoundingClientRect();
          const app = document.getElementById("app")!.getBoundingClientRect();
          const controls = Array.from(document.querySelectorAll<HTMLElement>("#app button, #app input, #app select, #app textarea, #app summary, #app [tabindex]:not([tabindex='-1'])")).filter((e) => e.offsetParent !== null && !(e as HTMLButtonElement).disabled && e.tabIndex >= 0);
          const bad: string[] = [];
          for (const c of controls) {
            c.focus();
            const r = c.getBoundingClientRect();
            const visible = r.bottom > app.top && r.top < footer.top - 0.5 && r.left >= app.left - 1 && r.right <= app.right + 1;
            if (!visible) bad.push(`${c.tagName} "${(c.getAttribute("aria-label") ?? c.textContent ?? "").slice(0, 40)}" at ${Math.round(r.top)}–${Math.round(r.bottom)}, footer at ${Math.round(footer.top)}`);
          }
          (document.activeElement as HTMLElement | null)?.blur();
          return { count: controls.length, bad };
        });
        expect(hidden.count, what).toBeGreaterThan(3);
        expect(hidden.bad, what).toEqual([]);
        // axe-core: no serious or critical violation in the pane.
        const violations = await p.evaluate(async () => {
          const axe = (window as unknown as { axe: { run(c: Element, o: object): Promise<{ violations: { id: string; impact: string; nodes: { target: string[] }[] }[] }> } }).axe;
          const r = await axe.run(document.getElementById("app")!, { resultTypes: ["violations"] });
          return r.violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => `${v.id} (${v.impact}): ${v.nodes.slice(0, 3).map((n) => n.target.join(" ")).join(", ")}`);
        });
        expect(violations, what).toEqual([]);
      }
      expect(pageErrors).toEqual([]);
      await context.close();
    }
  }, 120000);

});

describe.runIf(hasChromium)("the Excel pane page", () => {
  it("requests nothing from the network but Office.js", async () => {
    const preview = await startPreview();
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"] });
    try {
      const page = await browser.newPage();
      const outside: string[] = [];
      // No Office here: requests leaving 127.0.0.1 are recorded and refused.
      await page.route("**/*", (route) => {
        const url = route.request().url();
        if (url.startsWith("http://127.0.0.1:")) return route.continue();
        outside.push(url);
        return route.abort();
      });
      // Wait for the network to fall quiet (a condition, not a fixed time).
      await page.goto(preview.url.replace("preview.html", "taskpane.html"), { waitUntil: "networkidle" });
      expect(outside).toEqual(["https://appsforoffice.microsoft.com/lib/1/hosted/office.js"]);
    } finally {
      await browser.close();
      preview.server.kill();
    }
  }, 60000);
});

describe.runIf(hasChromium)("workbook text with markup", () => {
  it("renders as text, never as HTML", async () => {
    const dir = mkdtempSync(join(tmpdir(), "nappe-markup-"));
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("<i>Sheet<i>");
    ws.getCell("A1").value = '<img src=x onerror="window.__pwned=1">';
    ws.getCell("A2").value = "Flow <b>(gpm)</b>";
    ws.getCell("B2").value = 400;
    ws.getCell("B3").value = { formula: 'NAPPE.VELOCITY(B2, "<script>window.__pwned=2</script>")' };
    ws.getCell("B4").value = { formula: 'NAPPE.HEAD("<svg onload=window.__pwned=3>")' };
    const file = join(dir, "markup.xlsx");
    writeFileSync(file, Buffer.from(await book.xlsx.writeBuffer()));
    const preview = await startPreview(file);
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"] });
    try {
      const page = await browser.newPage();
      await page.goto(preview.url);
      await page.locator("table.grid").waitFor();
      await hasExactText(page.locator('td[data-address="A1"]'), '<img src=x onerror="window.__pwned=1">');
      await page.locator('td[data-address="B3"]').click();
      await containsText(page.locator(".cell-view"), "<script>window.__pwned=2</script>");
      await page.locator('td[data-address="B4"]').click();
      await containsText(page.locator(".cell-view"), "<svg onload=window.__pwned=3>");
      expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
      expect(await page.locator("img[src=x], .cell-view script, .cell-view svg, .grid b, .grid i").count()).toBe(0);
      await page.getByRole("button", { name: "<i>Sheet<i>" }).waitFor();
      await page.screenshot({ path: join(shots, "pane-markup-inert.png") });
    } finally {
      await browser.close();
      preview.server.kill();
    }
  }, 60000);
});

describe.runIf(hasChromium)("cross-check of a hand formula", () => {
  it("finds the explicit friction formula, and keeps the check in the workbook", async () => {
    const dir = mkdtempSync(join(tmpdir(), "nappe-hand-"));
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Hand");
    // Invented hand calculation: 400 gpm in 1000 ft of 6.065 in pipe, with the Swamee–Jain friction factor.
    const rows: [string, number | { formula: string }][] = [
      ["Flow (gpm)", 400],
      ["Inside diameter (in)", 6.065],
      ["Length (ft)", 1000],
      ["Roughness (in)", 0.0018],
      ["Kinematic viscosity (ft^2/s)", 1.0764e-5],
      ["Velocity (ft/s)", { formula: "B1*0.002228009/(PI()*(B2/12)^2/4)" }],
      ["Reynolds number", { formula: "B6*(B2/12)/B5" }],
      ["Friction factor", { formula: "0.25/LOG10(B4/B2/3.7+5.74/B7^0.9)^2" }],
      ["Head loss (ft)", { formula: "B8*B3/(B2/12)*B6^2/(2*32.174)" }],
    ];
    rows.forEach(([label, v], i) => {
      ws.getCell(i + 1, 1).value = label;
      ws.getCell(i + 1, 2).value = v;
    });
    const file = join(dir, "hand.xlsx");
    writeFileSync(file, Buffer.from(await book.xlsx.writeBuffer()));
    const preview = await startPreview(file);
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"] });
    try {
      const page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
      await page.goto(preview.url);
      await page.locator("table.grid").waitFor();
      await page.locator('td[data-address="B9"]').click();
      await page.getByRole("spinbutton", { name: "Tolerance, percent" }).fill("0.2");
      await page.getByRole("searchbox", { name: "Quantity the formula computes" }).fill("head loss darcy");
      await page.getByRole("button", { name: "NAPPE.HEADLOSS", exact: true }).click();
      const result = page.locator(".cross-check-result");
      await containsText(result, "First step that departs: B8 f (Darcy friction factor)");
      await containsText(result, "Differs"); // 0.40 % apart: beyond the 0.2 % asked for
      await containsText(result, "(tolerance 0.2 %)");
      await containsText(result, "explicit friction formula (Swamee–Jain)");
      await page.screenshot({ path: join(shots, "pane-cross-check.png") });
      await result.getByRole("button", { name: "Keep the check in the workbook" }).click();
      await containsText(page.locator(".status-line"), "Kept the check in Hand!C9");
      await page.locator('td[data-address="C9"]').click();
      await containsText(page.locator(".cell-view"), "NAPPE.CROSSCHECK");
      await containsText(page.locator("#formula-bar"), ", 0.002)");
    } finally {
      await browser.close();
      preview.server.kill();
    }
  }, 60000);
});

describe.runIf(hasChromium)("cross-check of hand sheets in the pane at 350 px", () => {
  /** A hand book in the preview, the pane at 350 px beside the grid with the hand cell selected. */
  async function withHandBook(id: string, cell: string, test: (page: Page) => Promise<void>, options: { stored?: boolean } = {}): Promise<void> {
    const file = join(mkdtempSync(join(tmpdir(), "nappe-hand-")), `${id}.xlsx`);
    writeFileSync(file, await handBookBytes(HAND_BOOKS.find((b) => b.id === id)!, options));
    const preview = await startPreview(file);
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"] });
    try {
      const page = await browser.newPage({ viewport: { width: 1100, height: 1400 } });
      await page.goto(`${preview.url}?pane=350&cell=${encodeURIComponent(cell)}`);
      await page.locator(".cell-address", { hasText: cell }).waitFor({ timeout: 20_000 });
      await test(page);
    } finally {
      await browser.close();
      preview.server.kill();
    }
  }
  async function pick(page: Page, search: string, id: string): Promise<Locator> {
    await page.getByRole("searchbox", { name: "Quantity the formula computes" }).fill(search);
    await page.getByRole("button", { name: `NAPPE.${id}`, exact: true }).click();
    return page.locator(".cross-check-result");
  }

  it("walks a Colebrook chain to any depth, asks for the length by hand, keeps the check, and Undo takes it back", async () => {
    await withHandBook("clean-si", "Calc!B17", async (page) => {
      const result = await pick(page, "head loss darcy", "HEADLOSS");
      // "Straight pipe, total (m)" names no length the vocabulary knows: the pane asks, it never guesses.
      await containsText(result, "length: no cell the hand formula reads is labelled as one; point it at a cell");
      await page.getByRole("textbox", { name: "length: read from" }).fill("Inputs!B3");
      await page.getByRole("button", { name: "Check again with these cells" }).click();
      await containsText(result.locator(".verdict"), "Agrees");
      await containsText(result, "Inputs!B3");
      await page.screenshot({ path: join(shots, "pane-cross-check-by-hand.png"), fullPage: true });
      await result.getByRole("button", { name: "Keep the check in the workbook" }).click();
      await containsText(page.locator(".status-line"), "Kept the check in Calc!C17");
      const undo = page.getByRole("button", { name: /^Undo/ });
      expect(await undo.getAttribute("aria-label")).toBe("Undo: keep the check in Calc!C17");
      await undo.click();
      await containsText(page.locator(".status-line"), "Undone: keep the check in Calc!C17.");
    }, { stored: true });
  }, 90_000);

  it("says incomplete, in amber, while Nappe assumes 20 °C; a temperature given by hand completes it", async () => {
    await withHandBook("npsh-no-temp-si", "Calc!B3", async (page) => {
      const result = await pick(page, "npsha", "NPSHA");
      const verdict = result.locator(".verdict");
      await containsText(verdict, "Incomplete: Nappe assumed 20 °C for the temperature");
      expect(await verdict.getAttribute("class")).toMatch(/\bwarning\b/);
      expect(await verdict.innerText()).not.toMatch(/Agrees/);
      expect(await result.getByRole("button", { name: "Keep the check in the workbook" }).isDisabled()).toBe(true);
      await page.screenshot({ path: join(shots, "pane-cross-check-incomplete.png"), fullPage: true });
      await page.getByRole("textbox", { name: "temperature: read from" }).fill("40 degC");
      await page.getByRole("button", { name: "Check again with these cells" }).click();
      await containsText(verdict, "Agrees");
      await containsText(result, "40 degC");
      expect(await result.getByRole("button", { name: "Keep the check in the workbook" }).isDisabled()).toBe(false);
      await containsText(result.locator("code.formula"), '"40 degC"');
    });
  }, 90_000);

  it("names a slip in a labelled constant cell, in the sheet's US units", async () => {
    await withHandBook("g322-us", "Calc!B17", async (page) => {
      await page.getByRole("spinbutton", { name: "Tolerance, percent" }).fill("0.05");
      const result = await pick(page, "head loss darcy", "HEADLOSS");
      await containsText(result.locator(".verdict"), "Differs: hand 31.76");
      await containsText(result, "First step that departs: B16 V²/2g (velocity head) 0.8876");
      await containsText(result, 'g = 32.2 ft/s² in Inputs!B6 ("g (ft/s²)")');
      const overflow = await page.evaluate(() => {
        const pane = document.querySelector<HTMLElement>("#app")!;
        return pane.scrollWidth - pane.clientWidth;
      });
      expect(overflow).toBeLessThanOrEqual(0);
      await page.screenshot({ path: join(shots, "pane-cross-check-us.png"), fullPage: true });
    });
  }, 90_000);
});

describe.runIf(hasChromium)("the HTML audit report in print", () => {
  it("opens with the summary and prints on A4 and Letter without anything cut at the right edge (Chromium's print-to-PDF)", async () => {
    const wb = await readWorkbook(join(root, "demo", DEMO_FILE));
    const report = buildAudit(recalculate(wb).cells, { title: "Nappe audit: orchard pumping station (invented demo)", source: DEMO_FILE, workbook: wb }, labelSource(wb));
    const dir = mkdtempSync(join(tmpdir(), "nappe-print-"));
    const file = join(dir, "audit.html");
    writeFileSync(file, renderHtml(report));
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"] });
    try {
      const page = await browser.newPage();
      await page.goto(`file://${file}`);
      const headings = await page.locator("h2").allInnerTexts();
      expect(headings.slice(0, 3)).toEqual(["Key results", "Inputs", "Every NAPPE formula, with its derivation"]);
      await page.emulateMedia({ media: "print" });
      // A4 is 210 mm and Letter 8.5 in wide; less the 12 mm margins each side, in CSS px (96 per inch).
      for (const [format, widthMm] of [["A4", 210], ["Letter", 215.9]] as const) {
        const printable = Math.floor(((widthMm - 24) / 25.4) * 96);
        await page.setViewportSize({ width: printable, height: 1000 });
        const overflow = await page.evaluate(() => {
          const root = document.documentElement;
          const wide = Array.from(document.querySelectorAll<HTMLElement>("body *")).filter((e) => e.getBoundingClientRect().right > root.clientWidth + 1 && !e.closest(".equation")).map((e) => `${e.tagName}.${e.className}`);
          return { page: root.scrollWidth - root.clientWidth, wide: [...new Set(wide)].slice(0, 5) };
        });
        expect(overflow, format).toEqual({ page: 0, wide: [] });
        const pdf = await page.pdf({ format, printBackground: true, margin: { top: "14mm", bottom: "14mm", left: "12mm", right: "12mm" } });
        const pages = (pdf.toString("latin1").match(/\/Type\s*\/Page[^s]/g) ?? []).length;
        expect(pages, format).toBeGreaterThan(3);
        writeFileSync(join(shots, `audit-report-${format}.pdf`), pdf);
      }
    } finally {
      await browser.close();
    }
  }, 60000);
});
