/**
 * Fails when a module exports a name nothing imports: dead exports are deleted, not kept "just
 * in case". Reads the program with the TypeScript compiler API (as tsc does), follows imports,
 * `export … from` and `import * as`, and counts a name used when any other file imports it.
 * Entry points (the worksheet bindings, the pane's pages, the command, scripts, tests) export
 * to the outside world and are not checked.
 *
 *   npx tsx scripts/unusedExports.ts   (run by npm run typecheck)
 */
import { dirname, join, relative, resolve } from "node:path";
import ts from "typescript";

const root = resolve(import.meta.dirname, "..");
const config = ts.getParsedCommandLineOfConfigFile(join(root, "tsconfig.json"), {}, { ...ts.sys, onUnRecoverableConfigFileDiagnostic: () => {} })!;
const program = ts.createProgram(config.fileNames, config.options);
const files = program.getSourceFiles().filter((f) => !f.isDeclarationFile && f.fileName.startsWith(root) && !f.fileName.includes("node_modules"));

const ENTRY = /^(functions\/functions\.ts|taskpane\/(taskpane|preview)\.ts|headless\/cli\.ts|demo\/write\.ts|scripts\/|test\/)/;

function resolveModule(from: string, spec: string): string | undefined {
  if (!spec.startsWith(".")) return undefined;
  const base = resolve(dirname(from), spec);
  for (const candidate of [`${base}.ts`, join(base, "index.ts"), base]) if (program.getSourceFile(candidate)) return candidate;
  return undefined;
}

/** Names each file exports (its own declarations and re-exports). */
const exported = new Map<string, Set<string>>();
/** Names imported from each file; "*" for a namespace import. */
const used = new Map<string, Set<string>>();
const reexportAll = new Map<string, string[]>();
const mark = (file: string, name: string) => {
  if (!used.has(file)) used.set(file, new Set());
  used.get(file)!.add(name);
};

/** `await import("./x")` uses every export of x. */
function markDynamicImports(file: ts.SourceFile): void {
  const visit = (node: ts.Node): void => {
    if (ts.isCallExpression(node) && node.expression.kind === ts.SyntaxKind.ImportKeyword && node.arguments[0] && ts.isStringLiteral(node.arguments[0])) {
      const target = resolveModule(file.fileName, node.arguments[0].text);
      if (target) mark(target, "*");
    }
    ts.forEachChild(node, visit);
  };
  visit(file);
}

for (const file of files) {
  markDynamicImports(file);
  const names = new Set<string>();
  exported.set(file.fileName, names);
  for (const stmt of file.statements) {
    const mods = ts.canHaveModifiers(stmt) ? ts.getModifiers(stmt) : undefined;
    const isExported = mods?.some((m) => m.kind === ts.SyntaxKind.ExportKeyword);
    if (isExported) {
      if (ts.isVariableStatement(stmt)) stmt.declarationList.declarations.forEach((d) => ts.isIdentifier(d.name) && names.add(d.name.text));
      else if ((ts.isFunctionDeclaration(stmt) || ts.isClassDeclaration(stmt) || ts.isInterfaceDeclaration(stmt) || ts.isTypeAliasDeclaration(stmt) || ts.isEnumDeclaration(stmt)) && stmt.name) names.add(stmt.name.text);
    }
    if (ts.isImportDeclaration(stmt) && ts.isStringLiteral(stmt.moduleSpecifier)) {
      const target = resolveModule(file.fileName, stmt.moduleSpecifier.text);
      const clause = stmt.importClause;
      if (!target || !clause) continue;
      if (clause.name) mark(target, "default");
      const bindings = clause.namedBindings;
      if (bindings && ts.isNamespaceImport(bindings)) mark(target, "*");
      if (bindings && ts.isNamedImports(bindings)) bindings.elements.forEach((e) => mark(target, (e.propertyName ?? e.name).text));
    }
    if (ts.isExportDeclaration(stmt)) {
      const target = stmt.moduleSpecifier && ts.isStringLiteral(stmt.moduleSpecifier) ? resolveModule(file.fileName, stmt.moduleSpecifier.text) : undefined;
      if (stmt.exportClause && ts.isNamedExports(stmt.exportClause)) {
        for (const e of stmt.exportClause.elements) {
          names.add(e.name.text);
          // Re-exporting a name uses it in the module it comes from (or in this one, for `export { x }`).
          mark(target ?? file.fileName, (e.propertyName ?? e.name).text);
        }
      } else if (target) {
        reexportAll.set(file.fileName, [...(reexportAll.get(file.fileName) ?? []), target]);
      }
    }
  }
}

// A name used through `export * from` counts as used in the module that declares it.
for (let changed = true; changed; ) {
  changed = false;
  for (const [file, targets] of reexportAll) {
    for (const name of used.get(file) ?? []) {
      for (const target of targets) {
        if (exported.get(target)?.has(name) || name === "*") {
          const before = used.get(target)?.size ?? 0;
          mark(target, name);
          if ((used.get(target)?.size ?? 0) !== before) changed = true;
        }
      }
    }
  }
}

const unused: string[] = [];
for (const [file, names] of exported) {
  const rel = relative(root, file).replace(/\\/g, "/");
  if (ENTRY.test(rel)) continue;
  const u = used.get(file) ?? new Set();
  if (u.has("*")) continue;
  for (const name of names) if (!u.has(name)) unused.push(`${rel}: ${name}`);
}
if (unused.length) {
  console.error(`Exports nothing imports (delete them, or stop exporting them):\n  ${unused.sort().join("\n  ")}`);
  process.exit(1);
}
console.log(`No unused exports in ${exported.size} files.`);
