/**
 * The preview as a newcomer meets it in a fresh clone: run directly, with no build yet, it builds
 * the add-in first, then serves the page, the workbook and the pane's scripts on 127.0.0.1, and
 * prints the address with its options.
 */
import { spawn } from "node:child_process";
import { existsSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { tempDir } from "./helpers";

const root = join(__dirname, "..");

describe("npm run preview in a fresh clone", () => {
  it("builds what is missing, then serves the pane and the workbook", async () => {
    const dist = join(tempDir(), "dist");
    expect(existsSync(dist)).toBe(false);
    const child = spawn(process.execPath, [join(root, "node_modules/tsx/dist/cli.mjs"), join(root, "scripts/preview.ts"), "--port", "0", "--no-open"], { cwd: root, env: { ...process.env, NAPPE_DIST_DIR: dist } });
    let out = "";
    try {
      const url = await new Promise<string>((done, fail) => {
        child.stdout.on("data", (d: Buffer) => {
          out += d.toString();
          const m = /(http:\/\/127\.0\.0\.1:\d+\/preview\.html) \(Ctrl\+C to stop\)/.exec(out);
          if (m && out.includes("?cell=Calc!B9")) done(m[1]);
        });
        child.on("exit", (code) => fail(new Error(`preview exited ${code}: ${out}`)));
      });
      expect(out).toMatch(/has no build yet: building the add-in first/);
      expect(out).toContain("?pane=350");
      expect(out).toContain("?cell=Calc!B9");
      const page = await fetch(url);
      expect(page.status).toBe(200);
      expect(await page.text()).toMatch(/<script[^>]+preview\.js/);
      const book = await (await fetch(url.replace("preview.html", "workbook.json"))).json();
      expect(book.name).toBe("orchard-pumping-station.xlsx");
      for (const script of ["preview.js", "formula.chunk.js"]) expect((await fetch(url.replace("preview.html", script))).status, script).toBe(200);
      expect(readdirSync(dist)).toContain("taskpane.html");
    } finally {
      child.kill();
    }
  }, 300_000);
});
