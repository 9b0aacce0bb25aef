/**
 * The structure of a formula's NAPPE calls, from fast-formula-parser's own lexer (the same
 * library that evaluates formulas): each call with its arguments' source text and position,
 * nested calls inside. Used to show arguments "as written" and to apply unit fixes.
 */
import { lex, type Token } from "fast-formula-parser/grammar/lexing";

export interface ArgSite {
  /** Source text of the argument, trimmed ("" when left out). */
  text: string;
  /** Offsets in the formula of the trimmed text: [start, end). */
  start: number;
  end: number;
}

export interface CallSite {
  /** Function name as written, upper case, without "(" ("NAPPE.HEAD"). */
  name: string;
  start: number;
  end: number;
  args: ArgSite[];
  /** Calls nested in the arguments, in source order. */
  children: CallSite[];
}

/** Every function call in a formula (without "="), outermost first. Throws on text the lexer cannot read. */
export function callSites(formula: string): CallSite[] {
  const { tokens } = lex(formula);
  const roots: CallSite[] = [];
  const stack: { call?: CallSite; argStart: number }[] = [];
  const closeArg = (frame: { call?: CallSite; argStart: number }, at: number) => {
    if (!frame.call) return;
    const raw = formula.slice(frame.argStart, at);
    const lead = raw.length - raw.trimStart().length;
    const text = raw.trim();
    frame.call.args.push({ text, start: frame.argStart + lead, end: frame.argStart + lead + text.length });
  };
  for (const t of tokens as Token[]) {
    const type = t.tokenType.name;
    if (type === "Function") {
      const call: CallSite = { name: t.image.slice(0, -1).trim().toUpperCase(), start: t.startOffset, end: -1, args: [], children: [] };
      const parent = [...stack].reverse().find((f) => f.call)?.call;
      (parent ? parent.children : roots).push(call);
      stack.push({ call, argStart: t.endOffset + 1 });
    } else if (type === "OpenParen" || type === "OpenCurlyParen") {
      stack.push({ argStart: t.endOffset + 1 });
    } else if (type === "Comma" || type === "Semicolon") {
      const frame = stack[stack.length - 1];
      if (frame?.call) {
        closeArg(frame, t.startOffset);
        frame.argStart = t.endOffset + 1;
      }
    } else if (type === "CloseParen" || type === "CloseCurlyParen") {
      const frame = stack.pop();
      if (frame?.call) {
        if (frame.call.args.length || formula.slice(frame.argStart, t.startOffset).trim()) closeArg(frame, t.startOffset);
        frame.call.end = t.endOffset + 1;
      }
    }
  }
  return roots;
}

/** Calls in the order they finish evaluating (arguments before the call that uses them). */
export function evaluationOrder(sites: readonly CallSite[]): CallSite[] {
  const out: CallSite[] = [];
  const visit = (s: CallSite) => {
    s.children.forEach(visit);
    out.push(s);
  };
  sites.forEach(visit);
  return out;
}

/** The formula with one argument's text replaced. */
export function replaceArgument(formula: string, arg: ArgSite, text: string): string {
  return formula.slice(0, arg.start) + text + formula.slice(arg.end);
}
