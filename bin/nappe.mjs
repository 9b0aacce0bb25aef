#!/usr/bin/env node
// The nappe command: runs the bundled build of headless/cli.ts (dist-cli/nappe.cjs, written by
// `npm run build` and by `npm install` through the prepare script).
import { existsSync } from "node:fs";
import module, { createRequire } from "node:module";
import { fileURLToPath } from "node:url";

const bundle = new URL("../dist-cli/nappe.cjs", import.meta.url);
if (!existsSync(bundle)) {
  console.error("nappe: the command is not built yet: run `npm run build` (npm install does it too)");
  process.exit(2);
}
// Node 22.1+ keeps the compiled code of the command and its libraries on disk between runs (most of
// a small run's start-up is compiling them); older Node has no such cache and runs as before.
module.enableCompileCache?.();
createRequire(import.meta.url)(fileURLToPath(bundle));
