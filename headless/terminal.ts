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
 * hanging indent). Each line keeps at least one word after its prefix; a word longer than a
 * whole line is cut, never left to overflow.
 */
export function wrapText(text: string, width: number, first = "", indent = ""): string[] {
  if (!Number.isFinite(width) || first.length + text.length <= width) return [`${first}${text}`.trimEnd()];
  const out: string[] = [];
  let line = first;
  let words = 0;
  for (let word of text.split(/\s+/).filter(Boolean)) {
    if (words && line.length + 1 + word.length > width) {
      out.push(line.trimEnd());
      line = indent;
      words = 0;
    }
    // A word longer than a whole line: cut it.
    while (!words && word.length > width - indent.length && line.length < width) {
      const cut = width - line.length;
      out.push(`${line}${word.slice(0, cut)}`);
      word = word.slice(cut);
      line = indent;
    }
    line += (words ? " " : "") + word;
    words++;
  }
  out.push(line.trimEnd());
  return out;
}
