/**
 * npm run preview [workbook.xlsx] [--port 3100] [--no-open]: serves the pane beside a read-only
 * grid of the demo workbook (or the one given) on 127.0.0.1, so anyone can try the pane without
 * Excel, and opens it in the browser where the system has one. Serves dist/ (built first when it
 * is missing) and /workbook.json. The page takes ?pane=350 (the pane's width in px, 280 to 420
 * as Excel gives it) and ?cell=Calc!B9 (a cell to select).
 */
import { spawn, spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { createServer } from "node:http";
import { readFile } from "node:fs/promises";
import { basename, extname, join, normalize, resolve } from "node:path";
import { readWorkbook, WorkbookError } from "../headless/readXlsx";

const root = join(import.meta.dirname, "..");
/** The built add-in: dist/, or NAPPE_DIST_DIR as the build takes it (webpack.config.js). */
const dist = process.env.NAPPE_DIST_DIR ? resolve(process.env.NAPPE_DIST_DIR) : join(root, "dist");
const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".json": "application/json",
  ".png": "image/png",
};
const CSP = "default-src 'none'; script-src 'self'; style-src 'self' 'unsafe-inline'; connect-src 'self'; img-src 'self' data:";

/** Builds the add-in into dist/ when it has never been built (a fresh clone), saying so. */
function buildIfMissing(): void {
  if (existsSync(join(dist, "preview.html"))) return;
  console.log(`${dist} has no build yet: building the add-in first (npm run build), about a minute...`);
  const r = spawnSync(process.execPath, [join(root, "node_modules/webpack/bin/webpack.js"), "--mode", "production", "--config-name", "addin"], { cwd: root, stdio: ["ignore", "ignore", "inherit"] });
  if (r.status !== 0 || !existsSync(join(dist, "preview.html"))) throw new Error("the build failed: run npm run build to see why");
}

/** Opens a page in the system's browser where there is one (never in CI or when asked not to). */
function openBrowser(url: string): void {
  if (process.env.CI || !process.stdout.isTTY) return;
  const [cmd, args] = process.platform === "darwin" ? ["open", [url]] : process.platform === "win32" ? ["cmd", ["/c", "start", "", url]] : ["xdg-open", [url]];
  const child = spawn(cmd, args, { stdio: "ignore", detached: true });
  child.on("error", () => console.log(`(no browser to open here: open ${url} yourself)`));
  child.unref();
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const noOpen = args.includes("--no-open");
  const portFlag = args.indexOf("--port");
  const port = portFlag >= 0 ? Number(args[portFlag + 1]) : 3100;
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new Error(`--port takes a port number, not "${args[portFlag + 1]}"`);
  const file = args.find((a, i) => !a.startsWith("--") && (portFlag < 0 || i !== portFlag + 1)) ?? join(root, "demo", "orchard-pumping-station.xlsx");
  buildIfMissing();
  const wb = await readWorkbook(file);
  const json = JSON.stringify({ name: basename(file), names: wb.names ?? [], sheets: wb.sheets.map((s) => ({ name: s.name, cells: [...s.cells.values()] })) });
  const server = createServer(async (req, res) => {
    const url = new URL(req.url ?? "/", "http://localhost");
    if (url.pathname === "/workbook.json") {
      res.writeHead(200, { "Content-Type": TYPES[".json"], "Cache-Control": "no-store" });
      res.end(json);
      return;
    }
    const path = url.pathname === "/" ? "/preview.html" : url.pathname;
    const target = normalize(join(dist, path));
    if (!target.startsWith(dist) || path.includes("..")) {
      res.writeHead(404).end();
      return;
    }
    try {
      const body = await readFile(target);
      const headers: Record<string, string> = { "Content-Type": TYPES[extname(target)] ?? "application/octet-stream", "X-Content-Type-Options": "nosniff" };
      // The preview page gets its policy as a header too; other pages (the Excel pane) carry their own.
      if (path === "/preview.html") headers["Content-Security-Policy"] = CSP;
      res.writeHead(200, headers);
      res.end(body);
    } catch {
      res.writeHead(404, { "Content-Type": "text/plain" }).end("not found");
    }
  });
  server.listen(port, "127.0.0.1", () => {
    const address = server.address();
    const actual = typeof address === "object" && address ? address.port : port;
    const url = `http://127.0.0.1:${actual}/preview.html`;
    console.log(`Nappe preview of ${basename(file)}: ${url} (Ctrl+C to stop)`);
    console.log(`  ${url}?pane=350  the pane at 350 px, as Excel gives it (280 to 420)`);
    console.log(`  ${url}?cell=Calc!B9  with a cell selected`);
    if (!noOpen) openBrowser(url);
  });
}

main().catch((e) => {
  console.error(e instanceof WorkbookError ? `preview: ${e.message}` : `preview: ${e instanceof Error ? e.message : String(e)}`);
  process.exit(2);
});
