/**
 * The plain text plan format: one line per agent (in scenario row order), each a list of cells
 * one per unit step, written `(x,y)` or `x,y`, separated by spaces; orientation-split plans add a
 * heading to every cell, `(x,y,E)` or `x,y,E`. Blank lines and `#` comments are ignored.
 * Example: `(0,0) (1,0) (1,1)`. Problems name line, column and field. Zod-free.
 */
import type { CellXY, Heading } from './plan';
import type { PlanFileProblem } from './submissions';

/** A parsed text plan: per agent its cells (and headings when asked for). */
export type TextPlan =
  | { readonly ok: true; readonly cells: readonly (readonly CellXY[])[]; readonly headings: readonly (readonly Heading[])[] }
  | { readonly ok: false; readonly problems: readonly PlanFileProblem[] };

/** At most this many problems are reported. */
const MAX_PROBLEMS = 20;

const PAREN = /\(\s*(-?\d+)\s*,\s*(-?\d+)\s*(?:,\s*([A-Za-z]+)\s*)?\)/y;
const BARE = /(-?\d+),(-?\d+)(?:,([A-Za-z]+))?(?=\s|$)/y;

/** Parses `text`; `withHeadings` demands a heading per cell (orientation-split) and forbids it otherwise. */
export function parsePlanText(text: string, options: { readonly file: string; readonly withHeadings: boolean }): TextPlan {
  const problems: PlanFileProblem[] = [];
  const cells: CellXY[][] = [];
  const headings: Heading[][] = [];
  const lines = text.split(/\r?\n/);
  const problem = (line: number, column: number, field: string, message: string) => {
    if (problems.length < MAX_PROBLEMS) problems.push({ file: options.file, line, column, field, message });
  };
  lines.forEach((raw, li) => {
    const hash = raw.indexOf('#');
    const content = hash >= 0 ? raw.slice(0, hash) : raw;
    if (content.trim() === '') return;
    const agent = cells.length;
    const row: CellXY[] = [];
    const rowHeadings: Heading[] = [];
    let i = 0;
    while (i < content.length) {
      if (/\s/.test(content[i])) {
        i++;
        continue;
      }
      const field = `agent ${agent}, cell ${row.length}`;
      PAREN.lastIndex = i;
      BARE.lastIndex = i;
      const m = PAREN.exec(content) ?? BARE.exec(content);
      if (!m) {
        const token = content.slice(i).split(/\s/)[0];
        problem(li + 1, i + 1, field, `expected a cell as (x,y) or x,y${options.withHeadings ? ' with a heading, e.g. (3,4,E)' : ''}, found "${token}"`);
        return;
      }
      const h = m[3];
      if (options.withHeadings) {
        if (h === undefined) {
          problem(li + 1, i + 1, field, 'orientation-split plans need a heading N, E, S or W with every cell, e.g. (3,4,E)');
          return;
        }
        if (!['N', 'E', 'S', 'W'].includes(h)) {
          problem(li + 1, i + 1 + m[0].indexOf(h), field, `heading must be N, E, S or W, found "${h}"`);
          return;
        }
        rowHeadings.push(h as Heading);
      } else if (h !== undefined) {
        problem(li + 1, i + 1 + m[0].indexOf(h), field, `this plan model takes cells without headings, found "${h}"`);
        return;
      }
      row.push([Number(m[1]), Number(m[2])]);
      i += m[0].length;
    }
    cells.push(row);
    headings.push(rowHeadings);
  });
  if (problems.length === 0 && cells.length === 0) problem(0, 0, 'plan', 'the file holds no agent lines');
  return problems.length > 0 ? { ok: false, problems } : { ok: true, cells, headings };
}
