/** Pane and bundle safety: no code from strings in any shipped bundle, strict CSP on the pages, budget. */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

const dist = join(__dirname, "..", "dist");
const bundles = readdirSync(dist).filter((f) => f.endsWith(".js"));

describe("shipped bundles", () => {
  it.each(bundles)("%s has no eval, new Function or Function constructor call", (f) => {
    const code = readFileSync(join(dist, f), "utf8");
    expect(code).not.toMatch(/(^|[^\w$.])eval\s*\(/);
    expect(code).not.toMatch(/new\s+Function\s*\(/);
    expect(code).not.toMatch(/(^|[^\w$.])Function\s*\(\s*["'`]/);
  });
  it.each(bundles)("%s carries no mathjs expression parser (user text is only ever read as units)", (f) => {
    const code = readFileSync(join(dist, f), "utf8");
    expect(code).not.toContain("Unexpected end of expression");
    expect(code).not.toContain("Parenthesis ) expected");
  });
  it("keeps the worksheet-functions bundle within its 250 KB budget (scripts/budget.ts fails the build too)", () => {
    expect(statSync(join(dist, "functions.js")).size).toBeLessThanOrEqual(250 * 1024);
  });
});

describe("Content-Security-Policy", () => {
  const csp = (page: string) => /http-equiv=["']?Content-Security-Policy["']? content="([^"]+)"/.exec(readFileSync(join(dist, page), "utf8"))?.[1] ?? "";
  it.each(["taskpane.html", "preview.html"])("%s has a strict policy: no eval, no inline script, no outside hosts but Office.js", (page) => {
    const policy = csp(page);
    expect(policy).toMatch(/default-src '(self|none)'/);
    expect(policy).not.toMatch(/unsafe-eval/);
    const scripts = /script-src ([^;]+)/.exec(policy)![1];
    expect(scripts).not.toMatch(/unsafe-inline/);
    expect(scripts.split(/\s+/).filter((s) => s !== "'self'")).toEqual(page === "taskpane.html" ? ["https://appsforoffice.microsoft.com"] : []);
    expect(/connect-src ([^;]+)/.exec(policy)![1].trim()).toBe("'self'");
  });
  it("the pages load no script from elsewhere but Office.js", () => {
    for (const page of ["taskpane.html", "preview.html"]) {
      const html = readFileSync(join(dist, page), "utf8");
      const srcs = [...html.matchAll(/<script[^>]*src=["']?([^"' >]+)/g)].map((m) => m[1]).filter((s) => /^https?:/.test(s));
      expect(srcs).toEqual(page === "taskpane.html" ? ["https://appsforoffice.microsoft.com/lib/1/hosted/office.js"] : []);
    }
  });
});
