/**
 * npm start: builds and serves the add-in over https on localhost:3000, then sideloads it into
 * desktop Excel where the platform has it (Windows, macOS). On Linux it prints how to sideload
 * into Excel on the web. Ctrl+C stops serving. Nothing here prompts for input.
 */
import { spawn } from "node:child_process";
import { get } from "node:https";
import { join } from "node:path";

const root = join(import.meta.dirname, "..");
const MANIFEST = join(root, "dist", "manifest.xml");
const URL_TO_WAIT_FOR = "https://localhost:3000/functions.json";

function fail(message: string): never {
  console.error(`\nnpm start: ${message}`);
  process.exit(1);
}

function isServing(): Promise<boolean> {
  return new Promise((resolve) => {
    const req = get(URL_TO_WAIT_FOR, { rejectUnauthorized: false, timeout: 2000 }, (res) => {
      res.resume();
      resolve(res.statusCode === 200);
    });
    req.on("error", () => resolve(false));
    req.on("timeout", () => req.destroy());
  });
}

async function waitForServer(seconds: number): Promise<void> {
  for (let i = 0; i < seconds; i++) {
    if (await isServing()) return;
    await new Promise((r) => setTimeout(r, 1000));
  }
  fail(`the https server did not answer at ${URL_TO_WAIT_FOR} within ${seconds} s (see the webpack output above).`);
}

/** office-addin-dev-settings is optional (its native keychain module may not build); load it by name. */
export async function devSettings(): Promise<{
  sideloadAddIn(manifest: string, app: unknown, canPrompt: boolean, launchOnly: boolean, appType: unknown): Promise<void>;
  unregisterAddIn(manifest: string): Promise<void>;
  AppType: { Desktop: unknown };
}> {
  const name = "office-addin-dev-settings";
  try {
    return await import(name);
  } catch {
    throw new Error(`${name} is not installed (it is optional: its keychain module needs a native build); run npm install on a machine where it builds`);
  }
}

async function sideloadDesktop(): Promise<void> {
  const { sideloadAddIn, AppType } = await devSettings();
  const { OfficeApp } = await import("office-addin-manifest");
  await sideloadAddIn(MANIFEST, OfficeApp.Excel, false, false, AppType.Desktop);
  console.log("\nSideloaded into desktop Excel. Type =NAPPE. in a cell; the Nappe button on the Home tab opens the pane.");
}

function explainWebSideload(): void {
  console.log(`
Serving the add-in at https://localhost:3000 (Ctrl+C to stop).

Desktop Excel does not run on ${process.platform}. To use Nappe in Excel on the web:
  1. Let your browser trust the local certificate: npx office-addin-dev-certs install
     (then open https://localhost:3000/taskpane.html once to check there is no warning).
  2. Open a workbook at https://www.office.com in the same browser.
  3. Home > Add-ins > More add-ins > My add-ins > Upload my add-in, and choose
     ${MANIFEST}
  4. Type =NAPPE. in a cell; the Nappe button on the Home tab opens the pane.
`);
}

async function main(): Promise<void> {
  const server = spawn(process.execPath, [join(root, "node_modules/webpack/bin/webpack.js"), "serve", "--mode", "development"], {
    cwd: root,
    stdio: ["ignore", "inherit", "inherit"],
  });
  server.on("exit", (code) => fail(`the development server stopped (exit code ${code}).`));
  process.on("SIGINT", () => {
    server.kill("SIGINT");
    process.exit(0);
  });
  await waitForServer(180);
  if (process.platform === "win32" || process.platform === "darwin") {
    try {
      await sideloadDesktop();
    } catch (e) {
      console.error(`Could not sideload into desktop Excel: ${e instanceof Error ? e.message : String(e)}`);
      explainWebSideload();
    }
  } else {
    explainWebSideload();
  }
}

if (process.argv[1]?.endsWith("start.ts")) main().catch((e) => fail(e instanceof Error ? e.message : String(e)));
