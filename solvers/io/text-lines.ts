/**
 * Splits an input text into lines the way both text formats are read: LF or CRLF line ends,
 * a leading UTF-8 byte-order mark ignored, trailing blanks (spaces, tabs) on each line and
 * blank lines at the end of the file ignored. Everything else is kept for the parser to judge.
 */

/** Lines of a text with line ends, trailing blanks and trailing blank lines removed. */
export function splitLines(text: string): string[] {
  const body = text.startsWith('\uFEFF') ? text.slice(1) : text;
  const lines = body.split('\n').map((line) => line.replace(/[ \t]*\r?$/, '').replace(/[ \t]+$/, ''));
  while (lines.length > 0 && lines[lines.length - 1] === '') lines.pop();
  return lines;
}

/** A whitespace-separated field of a line with its 1-based column. */
export interface LineField {
  readonly text: string;
  readonly column: number;
}

/** The space- or tab-separated fields of a line, each with its 1-based starting column. */
export function splitFields(line: string): LineField[] {
  const fields: LineField[] = [];
  for (const match of line.matchAll(/[^ \t]+/g)) {
    fields.push({ text: match[0], column: columnOf(line, match.index ?? 0) });
  }
  return fields;
}

/** The 1-based column (counted in characters, not UTF-16 units) of a string offset. */
export function columnOf(line: string, offset: number): number {
  let column = 1;
  for (let i = 0; i < offset; i++) {
    const code = line.charCodeAt(i);
    // The second half of a surrogate pair belongs to the character before it.
    if (code < 0xdc00 || code > 0xdfff) column++;
  }
  return column;
}
