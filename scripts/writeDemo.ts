/** Rewrites the committed demo workbook, demo/orchard-pumping-station.xlsx (npm run demo:build). */
import { writeFile } from "node:fs/promises";
import { join } from "node:path";
import { DEMO_FILE, demoWorkbookBytes } from "../demo/build";

const out = join(import.meta.dirname, "..", "demo", DEMO_FILE);
await writeFile(out, await demoWorkbookBytes());
console.log(`Wrote ${out}`);
