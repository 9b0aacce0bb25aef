/**
 * Publishing the add-in to a static HTTPS host: the build for another base URL
 * (NAPPE_BASE_URL=https://… npm run build) is a folder any static web host serves as it is, and
 * its manifest.xml is the file to give users. Checked on a build into a folder of its own
 * (NAPPE_DIST_DIR), for a made-up host: every URL in the manifest names a file in the folder, no
 * localhost is left, the icons have the sizes the manifest declares (Microsoft's manifest
 * reference: IconUrl 32×32, HighResolutionIconUrl 64×64, bt:Image at its size attribute), and
 * the third-party notices of what the scripts ship are there.
 */
import { execFileSync } from "node:child_process";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { tempDir } from "./helpers";

const root = join(__dirname, "..");
const BASE = "https://pumps.example.org/tools/nappe/";

/** Width and height from a PNG's IHDR chunk (PNG specification, 11.2.2). */
function pngSize(path: string): [number, number] {
  const b = readFileSync(path);
  expect(b.subarray(1, 4).toString("latin1")).toBe("PNG");
  return [b.readUInt32BE(16), b.readUInt32BE(20)];
}

function build(base: string, out: string): void {
  execFileSync(process.execPath, [join(root, "node_modules/webpack/bin/webpack.js"), "--mode", "production", "--config-name", "addin"], {
    cwd: root,
    env: { ...process.env, NAPPE_BASE_URL: base, NAPPE_DIST_DIR: out },
    stdio: "pipe",
    timeout: 300_000,
  });
}

describe("publishing to a static HTTPS host", () => {
  const out = join(tempDir(), "site");
  build(BASE, out);
  const manifest = readFileSync(join(out, "manifest.xml"), "utf8");

  it("points every URL of the manifest at a file of the built folder, under the base URL", () => {
    const urls = [...manifest.matchAll(/"(https?:\/\/[^"]+)"/g)].map((m) => m[1]).filter((u) => !u.startsWith("http://schemas.") && !u.startsWith("http://www.w3.org"));
    expect(urls.length).toBeGreaterThan(8);
    for (const url of urls) {
      expect(url.startsWith(BASE), url).toBe(true);
      const file = url.slice(BASE.length).split(/[?#]/)[0];
      expect(existsSync(join(out, file)), `${url} → ${file}`).toBe(true);
    }
  });
  it("leaves no localhost in the manifest or the pages", () => {
    expect(manifest).not.toMatch(/localhost/);
    for (const f of readdirSync(out).filter((f) => f.endsWith(".html"))) expect(readFileSync(join(out, f), "utf8"), f).not.toMatch(/localhost:3000/);
  });
  it("has icons of the sizes the manifest declares", () => {
    const icon = (id: string) => new RegExp(`<bt:Image id="${id}" DefaultValue="${BASE}([^"]+)"`).exec(manifest)![1];
    for (const size of [16, 32, 80]) expect(pngSize(join(out, icon(`Icon.${size}`)))).toEqual([size, size]);
    expect(pngSize(join(out, /<IconUrl DefaultValue="[^"]*\/(assets\/[^"]+)"/.exec(manifest)![1]))).toEqual([32, 32]);
    expect(pngSize(join(out, /<HighResolutionIconUrl DefaultValue="[^"]*\/(assets\/[^"]+)"/.exec(manifest)![1]))).toEqual([64, 64]);
  });
  it("ships the third-party notices of what its scripts hold, none under a copyleft licence", () => {
    const notices = readFileSync(join(out, "THIRD-PARTY-NOTICES.txt"), "utf8");
    for (const pkg of ["mathjs", "chart.js", "katex"]) expect(notices).toMatch(new RegExp(`^${pkg.replace(".", "\\.")} [\\d.]+ \\(`, "m"));
    expect(notices).toContain("Apache License");
    const licences = [...notices.matchAll(/^\S+ [\d.]+\S* \(([^)]+)\)$/gm)].map((m) => m[1]);
    for (const l of licences) expect(l).toMatch(/^(MIT|Apache-2\.0|BSD-[23]-Clause|ISC|0BSD)$/);
  });
  it("refuses a base URL that is not https", () => {
    let output = "";
    try {
      build("http://pumps.example.org/", join(tempDir(), "plain"));
    } catch (e) {
      const { stdout, stderr } = e as { stdout: Buffer; stderr: Buffer };
      output = `${stdout}${stderr}`;
    }
    expect(output).toMatch(/NAPPE_BASE_URL must be an https:\/\/ address/);
  });
});
