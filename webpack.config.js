// Builds dist/: the worksheet-functions bundle with functions.json (generated from the JSDoc of
// functions/functions.ts), functions.html, the pane, the icons and the manifest.
import CopyWebpackPlugin from "copy-webpack-plugin";
import CustomFunctionsMetadataPlugin from "custom-functions-metadata-plugin";
import HtmlWebpackPlugin from "html-webpack-plugin";
import webpack from "webpack";
import { existsSync, readFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.dirname(fileURLToPath(import.meta.url));
const DEV_URL = "https://localhost:3000/";

/** Rewrites the manifest's development URLs when NAPPE_BASE_URL names another host. */
function manifestFor(content) {
  const base = process.env.NAPPE_BASE_URL;
  if (!base) return content;
  return content.toString().replaceAll(DEV_URL, base.endsWith("/") ? base : `${base}/`);
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
  const config = {
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
    output: { path: path.join(root, "dist"), filename: "[name].js", chunkFilename: "[name].chunk.js", clean: true },
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
    static: { directory: path.join(root, "dist") },
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
    target: "node20",
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
    ],
    performance: { hints: false },
  };
}
