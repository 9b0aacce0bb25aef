/**
 * npm run preview [workbook.xlsx] [--port 3100]: serves the pane beside a read-only grid of the
 * demo workbook (or the one given) on 127.0.0.1, so anyone can try the pane without Excel.
 * Serves dist/ (run npm run build first; npm run preview does) and /workbook.json.
 */
import { createServer } from "node:http";
import { readFile } from "node:fs/promises";
import { basename, extname, join, normalize } from "node:path";
import { readWorkbook, WorkbookError } from "../headless/readXlsx";

const root = join(import.meta.dirname, "..");
const dist = join(root, "dist");
const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".json": "application/json",
  ".png": "image/png",
};
const CSP = "default-src 'none'; script-src 'self'; style-src 'self' 'unsafe-inline'; connect-src 'self'; img-src 'self' data:";

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const portFlag = args.indexOf("--port");
  const port = portFlag >= 0 ? Number(args[portFlag + 1]) : 3100;
  const file = args.find((a, i) => !a.startsWith("--") && (portFlag < 0 || i !== portFlag + 1)) ?? join(root, "demo", "orchard-pumping-station.xlsx");
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
    console.log(`Nappe preview of ${basename(file)}: http://127.0.0.1:${actual}/preview.html (Ctrl+C to stop)`);
  });
}

main().catch((e) => {
  console.error(e instanceof WorkbookError ? `preview: ${e.message}` : `preview: ${e instanceof Error ? e.message : String(e)}`);
  process.exit(2);
});
