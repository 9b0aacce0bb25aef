/**
 * Bundle budgets, run after every production build; the build fails above either.
 *  - functions.js, the worksheet bundle Excel loads: at most 250 KB minified (the speed issue's
 *    target; mathjs is built from its unit factories only, and the catalogue's documentation is
 *    left out of this bundle by scripts/specDocsLoader.cjs).
 *  - The pane's first load, the script taskpane.html loads: taskpane.js, at most 400 KB (the
 *    speed issue's target). The formula library, KaTeX and Chart.js are chunks of their own,
 *    loaded the first time a formula is analysed, an equation shown, a chart drawn.
 */
import { readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { gzipSync } from "node:zlib";

const BUDGETS: [file: string, bytes: number, note: string][] = [
  ["functions.js", 250 * 1024, "the worksheet bundle"],
  ["taskpane.js", 400 * 1024, "the pane's first load"],
];

let failed = false;
for (const [name, budget, note] of BUDGETS) {
  const file = join(import.meta.dirname, "..", "dist", name);
  const bytes = statSync(file).size;
  const gzip = gzipSync(readFileSync(file)).length;
  const line = `${name}: ${(bytes / 1024).toFixed(1)} KB minified, ${(gzip / 1024).toFixed(1)} KB gzipped (budget ${budget / 1024} KB minified, ${note})`;
  if (bytes > budget) {
    console.error(`Bundle budget exceeded: ${line}`);
    failed = true;
  } else console.log(line);
}
if (failed) process.exit(1);
