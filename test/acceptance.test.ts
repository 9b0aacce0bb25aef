/**
 * docs/acceptance.md, the ten-minute check for the first engineer with Excel, says what the pane
 * shows for five cells and for the workbook check, and what `nappe recalc` prints: the preview
 * page at 350 px in Debian's Chromium must show exactly those words for the same cells, and the
 * command print that line, so that a difference the engineer sees in Excel is a difference
 * between Excel and the preview. The screenshots it shows exist (scripts/acceptance.ts makes
 * them from the same page).
 */
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { ChildProcess } from "node:child_process";
import type { Browser } from "playwright-core";
import { DEMO_FILE } from "../demo/build";
import { ACCEPTANCE_CELLS, CHROMIUM, launch, paneAfterCheck, paneForCell, startPreview } from "../scripts/acceptance";
import { nappe } from "./helpers";

const root = join(__dirname, "..");
const doc = readFileSync(join(root, "docs/acceptance.md"), "utf8");
const hasChromium = existsSync(CHROMIUM);
if (!hasChromium) {
  if (process.env.NAPPE_REQUIRE_BROWSER === "1") throw new Error(`NAPPE_REQUIRE_BROWSER=1 but ${CHROMIUM} is missing`);
  console.warn(`\n! ACCEPTANCE CHECK AGAINST THE PREVIEW SKIPPED: ${CHROMIUM} is missing (apt-get install -y chromium).\n`);
}

/** The document's steps: title, the cell it selects (if any), and the quoted words of its "You should see:" line. */
const steps = doc
  .split(/^### /m)
  .slice(1)
  .map((s) => ({ title: s.split("\n")[0], cell: /select `([^`]+)`/.exec(s.split("\n")[0])?.[1], see: [...(/^You should see: (.*)$/m.exec(s)?.[1] ?? "").matchAll(/`([^`]+)`/g)].map((m) => m[1]) }));

describe("the acceptance check's document", () => {
  it("has ten steps, selects the five cells in order, and shows screenshots that exist", () => {
    expect(steps.length).toBe(10);
    expect(steps.filter((s) => s.cell).map((s) => s.cell)).toEqual([...ACCEPTANCE_CELLS]);
    for (const [, path] of doc.matchAll(/!\[[^\]]*\]\(([^)]+)\)/g)) expect(existsSync(join(root, "docs", path)), path).toBe(true);
  });
  it("quotes the line `nappe recalc` prints for the demo", async () => {
    const r = await nappe("recalc", join(root, "demo", DEMO_FILE));
    const step = steps.find((s) => s.title.startsWith("10."))!;
    // The line as the terminal shows it at 80 columns: what it found, then the statuses indented below.
    expect(step.see.length).toBe(2);
    expect(r.stdout).toContain(`${step.see[0]}\n  ${step.see[1]}`);
    expect(r.code).toBe(0);
  });
});

describe.runIf(hasChromium)("the acceptance check against the preview at 350 px", () => {
  let browser: Browser;
  let preview: { url: string; server: ChildProcess };
  beforeAll(async () => {
    preview = await startPreview();
    browser = await launch();
  }, 120_000);
  afterAll(async () => {
    await browser?.close();
    preview?.server.kill();
  });
  for (const cell of ACCEPTANCE_CELLS) {
    it(`shows for ${cell} the words the document quotes`, async () => {
      const step = steps.find((s) => s.cell === cell)!;
      expect(step.see.length).toBeGreaterThan(1);
      const { page, text } = await paneForCell(browser, preview.url, cell);
      await page.close();
      for (const words of step.see) expect(text, `${cell}: ${words}`).toContain(words);
    }, 60_000);
  }
  it("shows the workbook check's counts the document quotes", async () => {
    const step = steps.find((s) => s.title.startsWith("8."))!;
    const { page, text } = await paneAfterCheck(browser, preview.url);
    await page.close();
    const flat = text.replace(/\s+/g, " ");
    for (const words of step.see) expect(flat, words).toContain(words);
  }, 60_000);
});
