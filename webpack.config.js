// Builds dist/: the worksheet-functions bundle with functions.json (generated from the JSDoc of
// functions/functions.ts), functions.html, the pane, the icons and the manifest.
import CopyWebpackPlugin from "copy-webpack-plugin";
import CustomFunctionsMetadataPlugin from "custom-functions-metadata-plugin";
import HtmlWebpackPlugin from "html-webpack-plugin";
import webpack from "webpack";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.dirname(fileURLToPath(import.meta.url));
const DEV_URL = "https://localhost:3000/";
/** Where the add-in is built: dist/, or NAPPE_DIST_DIR (the publishing test builds into a folder of its own). */
const distDir = process.env.NAPPE_DIST_DIR ? path.resolve(process.env.NAPPE_DIST_DIR) : path.join(root, "dist");

/**
 * Writes THIRD-PARTY-NOTICES.txt beside a build's scripts: every package whose code the bundles
 * ship, with its version, licence and licence text (read from the package itself).
 */
class ThirdPartyNotices {
  apply(compiler) {
    compiler.hooks.thisCompilation.tap("ThirdPartyNotices", (compilation) => {
      compilation.hooks.processAssets.tap({ name: "ThirdPartyNotices", stage: webpack.Compilation.PROCESS_ASSETS_STAGE_REPORT }, () => {
        const packages = new Map();
        for (const module of compilation.modules) {
          const resources = [module.resource, ...(module.modules ?? []).map((m) => m.resource)].filter(Boolean);
          for (const resource of resources) {
            const m = /[\\/]node_modules[\\/]((?:@[^\\/]+[\\/])?[^\\/]+)/.exec(resource);
            if (!m) continue;
            const dir = resource.slice(0, m.index + m[0].length);
            if (packages.has(dir)) continue;
            const pkg = JSON.parse(readFileSync(path.join(dir, "package.json"), "utf8"));
            const licenceFile = readdirSync(dir).find((f) => /^(licen[cs]e|copying)(\.|$)/i.test(f));
            packages.set(dir, { name: pkg.name, version: pkg.version, license: typeof pkg.license === "string" ? pkg.license : pkg.license?.type ?? "see the package", text: licenceFile ? readFileSync(path.join(dir, licenceFile), "utf8").trim() : "" });
          }
        }
        const list = [...packages.values()].sort((a, b) => a.name.localeCompare(b.name));
        const body = [
          "Nappe ships code of the following packages in its built scripts, under their own licences.",
          "",
          ...list.flatMap((p) => [`${"=".repeat(78)}`, `${p.name} ${p.version} (${p.license})`, "", p.text || `Licence: ${p.license} (no licence file in the package).`, ""]),
        ].join("\n");
        compilation.emitAsset("THIRD-PARTY-NOTICES.txt", new webpack.sources.RawSource(body));
      });
    });
  }
}

/** Rewrites the manifest's development URLs when NAPPE_BASE_URL names another host. */
function manifestFor(content) {
  const base = process.env.NAPPE_BASE_URL;
  if (!base) return content;
  const url = base.endsWith("/") ? base : `${base}/`;
  return content
    .toString()
    .replace(/<!--[\s\S]*?-->/, `<!-- Nappe add-in-only manifest, built for ${url} (give this file to users: README, "Publishing"). -->`)
    .replaceAll(DEV_URL, url);
}

/**
 * Development certificate from office-addin-dev-certs. Installing its CA needs administrator
 * rights (sudo on Linux); where that fails, the generated certificate is served anyway and the
 * user is told how to trust it, instead of the server failing.
 */
async function httpsOptions() {
  const devCerts = await import("office-addin-dev-certs");
  try {
    return await devCerts.getHttpsServerOptions();
  } catch (e) {
    const dir = path.join(os.homedir(), ".office-addin-dev-certs");
    const file = (name) => path.join(dir, name);
    if (!existsSync(file("localhost.crt"))) await devCerts.generateCertificates();
    console.warn(
      `\nCould not install the development CA certificate (${String(e.message ?? e).split("\n")[0]}).\n` +
        `Serving with ${file("localhost.crt")}; make your browser trust ${file("ca.crt")}, ` +
        "or run `npx office-addin-dev-certs install` with administrator rights.\n",
    );
    return { ca: readFileSync(file("ca.crt")), cert: readFileSync(file("localhost.crt")), key: readFileSync(file("localhost.key")) };
  }
}

export default async (env, argv) => {
  const dev = argv.mode === "development";
  // Office loads an add-in's pages and scripts over HTTPS only.
  const base = process.env.NAPPE_BASE_URL;
  if (base && !/^https:\/\/[^/\s]+/.test(base)) throw new Error(`NAPPE_BASE_URL must be an https:// address (Office loads add-ins over HTTPS only), not "${base}"`);
  const config = {
    name: "addin",
    devtool: dev ? "source-map" : false,
    // The worksheet bundle is its own layer, so that its copy of the catalogue can leave out the
    // documentation Excel's runtime never shows (scripts/specDocsLoader.cjs).
    experiments: { layers: true },
    entry: {
      functions: { import: "./functions/functions.ts", layer: "worksheet" },
      taskpane: "./taskpane/taskpane.ts",
      preview: "./taskpane/preview.ts",
    },
    // Chart.js is its own chunk (chart.chunk.js), loaded the first time a cell has a chart.
    output: { path: distDir, filename: "[name].js", chunkFilename: "[name].chunk.js", clean: true },
    resolve: {
      extensions: [".ts", ".js"],
      // The pane's workbook model is pure; Node-only modules of the headless command stay out.
      fallback: { fs: false, "node:fs/promises": false, path: false },
    },
    module: {
      rules: [
        { test: /\.ts$/, exclude: /node_modules/, use: { loader: "ts-loader", options: { transpileOnly: true } } },
        { test: /functions[\\/]catalog[\\/][a-zA-Z]+\.ts$/, issuerLayer: "worksheet", enforce: "pre", use: path.join(root, "scripts/specDocsLoader.cjs") },
      ],
    },
    performance: { hints: false },
    plugins: [
      // The pane loads the formula engine's function library as a chunk of its own (formula.chunk.js),
      // the first time it analyses a formula: its first script stays small (taskpane/formulaLibraryLazy.ts).
      new webpack.NormalModuleReplacementPlugin(/(^|[\\/])formulaLibrary$/, path.join(root, "taskpane/formulaLibraryLazy.ts")),
      new CustomFunctionsMetadataPlugin({ output: "functions.json", input: "./functions/functions.ts" }),
      new ThirdPartyNotices(),
      new HtmlWebpackPlugin({ filename: "functions.html", template: "./functions/functions.html", chunks: ["functions"] }),
      new HtmlWebpackPlugin({ filename: "taskpane.html", template: "./taskpane/taskpane.html", chunks: ["taskpane"] }),
      new HtmlWebpackPlugin({ filename: "preview.html", template: "./taskpane/preview.html", chunks: ["preview"] }),
      new CopyWebpackPlugin({
        patterns: [
          { from: "manifest/assets", to: "assets" },
          { from: "taskpane/pane.css", to: "pane.css" },
          { from: "manifest/manifest.xml", to: "manifest.xml", transform: manifestFor },
        ],
      }),
    ],
  };
  if (!dev) return [config, commandConfig()];
  config.devServer = {
    host: "localhost",
    port: 3000,
    devMiddleware: { writeToDisk: true },
    headers: { "Access-Control-Allow-Origin": "*" },
    server: { type: "https", options: await httpsOptions() },
    static: { directory: distDir },
  };
  return config;
};

/**
 * The nappe command, bundled for Node into dist-cli/nappe.cjs (bin/nappe.mjs runs it): no
 * TypeScript compiled at start-up, and mathjs tree-shaken to its units as in the worksheet
 * bundle. Other packages stay in node_modules and load as Node loads them.
 */
function commandConfig() {
  const bundled = /^(mathjs|typed-function|decimal\.js|complex\.js|fraction\.js|javascript-natural-sort|seedrandom|tiny-emitter|escape-latex|@babel\/runtime)(\/|$)/;
  return {
    name: "command",
    target: "node22",
    devtool: false,
    entry: { nappe: "./headless/cli.ts" },
    output: { path: path.join(root, "dist-cli"), filename: "[name].cjs", clean: true, library: { type: "commonjs2" } },
    resolve: { extensions: [".ts", ".js"] },
    externalsPresets: { node: true },
    externals: [({ request }, callback) => (request && !request.startsWith(".") && !path.isAbsolute(request) && !bundled.test(request) ? callback(null, `commonjs ${request}`) : callback())],
    module: {
      rules: [{ test: /\.ts$/, exclude: /node_modules/, use: { loader: "ts-loader", options: { transpileOnly: true } } }],
    },
    // Minified: V8 reads the whole file at start-up, and the smaller text is read faster (the command's
    // start-up is measured in the bench). Messages are our own text; only a crash's stack shows short names.
    optimization: { minimize: true },
    // One file: the modules reached by import() (exceljs, the demo, the hand-off copy) are still
    // evaluated only when a command needs them, so `nappe recalc` starts without them.
    plugins: [
      new webpack.optimize.LimitChunkCountPlugin({ maxChunks: 1 }),
      new ThirdPartyNotices(),
    ],
    performance: { hints: false },
  };
}
