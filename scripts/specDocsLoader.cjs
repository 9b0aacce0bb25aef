/**
 * Webpack loader for the worksheet bundle only (webpack.config.js applies it to the catalogue's
 * topic files in the "worksheet" layer): takes the documentation out of each defineSpec({...})
 * (purpose, equation, derivation, assumptions, validity, cautions, sources, examples). Excel's
 * runtime evaluates the functions and never shows those texts; the pane, the docs and the
 * reports get them from the full catalogue. Parameters, results and compute stay as written.
 */
const ts = require("typescript");

const DOCUMENTATION = new Set(["purpose", "equation", "derivation", "assumptions", "validity", "cautions", "sources", "examples"]);

module.exports = function specDocsLoader(source) {
  const file = ts.createSourceFile(this.resourcePath, source, ts.ScriptTarget.Latest, true, ts.ScriptKind.TS);
  const cuts = [];
  const visit = (node) => {
    if (ts.isCallExpression(node) && ts.isIdentifier(node.expression) && node.expression.text === "defineSpec") {
      const spec = node.arguments[0];
      if (spec && ts.isObjectLiteralExpression(spec)) {
        for (const p of spec.properties) {
          if (p.name && ts.isIdentifier(p.name) && DOCUMENTATION.has(p.name.text)) cuts.push([p.getStart(file), p.getEnd()]);
        }
      }
    }
    ts.forEachChild(node, visit);
  };
  visit(file);
  let out = source;
  for (const [start, end] of cuts.sort((a, b) => b[0] - a[0])) {
    const comma = /^\s*,/.exec(out.slice(end));
    out = out.slice(0, start) + out.slice(end + (comma ? comma[0].length : 0));
  }
  return out;
};
