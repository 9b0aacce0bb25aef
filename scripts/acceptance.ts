/**
 * npx tsx scripts/acceptance.ts: the screenshots of docs/acceptance.md, regenerated from the
 * preview page at 350 px (the pane as Excel gives it) in Debian's Chromium: the five cells the
 * acceptance check selects, and the workbook check. Prints each view's text too, which the
 * document quotes (test/acceptance.test.ts holds the two together).
 */
import { type ChildProcess, spawn } from "node:child_process";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { type Browser, chromium, type Page } from "playwright-core";

const root = join(import.meta.dirname, "..");

/** The cells docs/acceptance.md has the engineer select, in its order. */
export const ACCEPTANCE_CELLS = ["Calc!B9", "Calc!B21", "Calc!B28", "Calc!B31", "Calc!B36"] as const;

export const CHROMIUM = "/usr/bin/chromium";

/** Starts the preview of the demo workbook (or the one given) on a free port. */
export async function startPreview(file?: string): Promise<{ url: string; server: ChildProcess }> {
  const server = spawn(process.execPath, ["--import", "tsx", "scripts/preview.ts", "--port", "0", "--no-open", ...(file ? [file] : [])], { cwd: root, stdio: ["ignore", "pipe", "pipe"] });
  const url = await new Promise<string>((resolve, reject) => {
    let out = "";
    const timer = setTimeout(() => reject(new Error(`preview server did not start: ${out}`)), 120_000);
    server.stdout!.on("data", (d) => {
      out += String(d);
      const m = /(http:\/\/127\.0\.0\.1:\d+\/preview\.html) \(/.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve(m[1]);
      }
    });
    server.stderr!.on("data", (d) => (out += String(d)));
    server.on("exit", (code) => reject(new Error(`preview server exited (${code}): ${out}`)));
  });
  return { url, server };
}

export function launch(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM, args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"] });
}

/** The pane's text with a cell selected, once its view is drawn (and the page, for a screenshot). */
export async function paneForCell(browser: Browser, url: string, cell: string): Promise<{ page: Page; text: string }> {
  const page = await browser.newPage({ viewport: { width: 1100, height: 1400 } });
  await page.goto(`${url}?pane=350&cell=${encodeURIComponent(cell)}`);
  await page.locator(".cell-address", { hasText: cell }).waitFor({ timeout: 20_000 });
  await page.locator("#app .call").first().waitFor({ timeout: 20_000 });
  return { page, text: await page.locator("#app").innerText() };
}

/** The pane's text after the whole-workbook check. */
export async function paneAfterCheck(browser: Browser, url: string): Promise<{ page: Page; text: string }> {
  const page = await browser.newPage({ viewport: { width: 1100, height: 1400 } });
  await page.goto(`${url}?pane=350`);
  await page.getByRole("tab", { name: "Workbook" }).click();
  await page.getByRole("button", { name: "Check the whole workbook" }).click();
  await page.locator(".check-row").first().waitFor({ timeout: 30_000 });
  return { page, text: await page.locator("#app").innerText() };
}

async function main(): Promise<void> {
  const out = join(root, "docs", "acceptance");
  mkdirSync(out, { recursive: true });
  const { url, server } = await startPreview();
  const browser = await launch();
  try {
    for (const [i, cell] of ACCEPTANCE_CELLS.entries()) {
      const { page, text } = await paneForCell(browser, url, cell);
      await page.locator("#app").screenshot({ path: join(out, `${i + 1}-${cell.replace("!", "-")}.png`) });
      console.log(`--- ${cell}\n${text}\n`);
      await page.close();
    }
    const { page, text } = await paneAfterCheck(browser, url);
    await page.locator("#app").screenshot({ path: join(out, "6-workbook-check.png") });
    console.log(`--- workbook check\n${text}\n`);
    await page.close();
  } finally {
    await browser.close();
    server.kill();
  }
}

if (process.argv[1] && import.meta.filename === process.argv[1]) await main();
