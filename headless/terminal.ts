/**
 * Text for a person at a terminal: the width to fit (the terminal's, COLUMNS where set, 80 when
 * the output is not a terminal; unlimited with --wide), words wrapped with a hanging indent, and
 * counts with their grammar ("1 formula", "2 formulas").
 */

/** The width to fit: `wide` gives no limit; else COLUMNS, the terminal's width, or 80. */
export function outputWidth(wide = false, stream: { isTTY?: boolean; columns?: number } = process.stdout): number {
  if (wide) return Infinity;
  const columns = Number(process.env.COLUMNS);
  if (Number.isInteger(columns) && columns >= 20) return columns;
  if (stream.isTTY && stream.columns && stream.columns >= 20) return stream.columns;
  return 80;
}

/**
 * Wraps `text` to `width`: the first line starts with `first`, the others with `indent` (a
 * hanging indent). A word longer than a line is cut, never left to overflow.
 */
export function wrapText(text: string, width: number, first = "", indent = ""): string[] {
  if (!Number.isFinite(width) || first.length + text.length <= width) return [`${first}${text}`.trimEnd()];
  const out: string[] = [];
  let line = first;
  const room = () => width - line.length;
  for (let word of text.split(/\s+/).filter(Boolean)) {
    const lead = line.length > (out.length ? indent.length : first.length) ? " " : "";
    if (lead.length + word.length > room()) {
      if (line.trim()) {
        out.push(line.trimEnd());
        line = indent;
      }
      // A word longer than a whole line: cut it.
      while (word.length > width - line.length) {
        const cut = Math.max(1, width - line.length);
        out.push(`${line}${word.slice(0, cut)}`);
        word = word.slice(cut);
        line = indent;
      }
    }
    line += (line.length > (out.length ? indent.length : first.length) ? " " : "") + word;
  }
  if (line.trim()) out.push(line.trimEnd());
  return out;
}

/** "1 formula", "2 formulas", "0 formulas". */
export function plural(n: number, noun: string, many = `${noun}s`): string {
  return `${n} ${n === 1 ? noun : many}`;
}
