// Stands in for chevrotain's parser code generator in the pane bundles. The generator builds
// code with `new Function`, which the pane's Content-Security-Policy forbids and which Nappe
// never uses (fast-formula-parser builds its parser directly). Calling it is an error.
function unavailable() {
  throw new Error("chevrotain code generation is not included in Nappe's bundles");
}
exports.generateParserFactory = unavailable;
exports.generateParserModule = unavailable;
