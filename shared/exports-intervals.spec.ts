/**
 * Comparison exports of an execution figure carry each model value's 95 % interval (issue 12,
 * item 5): CSV and JSON in separate low / high columns, Markdown and LaTeX as "x [lo, hi]", with
 * "interval not stored" for a value without one; the bold best value is unchanged by them.
 */
import { toCsv } from './exports-csv';
import { toJsonExport, type ExportJson } from './exports-json';
import { latexEscape, toLatex } from './exports-latex';
import { toMarkdown } from './exports-markdown';
import { displayWithInterval, withIntervalColumns, type ExportTable } from './exports-table';

const table: ExportTable = {
  caption: 'Execution success rate, open-loop',
  columns: [
    { id: 'map', label: 'Map', kind: 'text' },
    { id: 'm_classic', label: 'classic', kind: 'number', better: 'higher', digits: 2 },
    { id: 'm_orientation_split', label: 'orientation-split', kind: 'number', better: 'higher', digits: 2 },
  ],
  rows: [
    ['a', 0.7, 0.9],
    ['b', 0.5, null],
  ],
  compareColumns: ['m_classic', 'm_orientation_split'],
  intervals: [
    { m_classic: [0.3968, 0.8922], m_orientation_split: null },
    { m_classic: [0.2, 0.8], m_orientation_split: null },
  ],
};

describe('comparison exports with 95 % intervals', () => {
  it('adds a low and a high column after each model column in CSV, at full precision', () => {
    expect(toCsv(table)).toBe([
      '# caption: Execution success rate, open-loop',
      'Map,classic,"classic, 95 % CI low","classic, 95 % CI high",orientation-split,"orientation-split, 95 % CI low","orientation-split, 95 % CI high"',
      'a,0.7,0.3968,0.8922,0.9,,',
      'b,0.5,0.2,0.8,,,',
      '',
    ].join('\r\n'));
  });

  it('keys the bounds in JSON as <column>_lo / <column>_hi, null when not stored', () => {
    const doc = JSON.parse(toJsonExport(table)) as ExportJson;
    expect(doc.columns.map((c) => c.id)).toEqual(['map', 'm_classic', 'm_classic_lo', 'm_classic_hi', 'm_orientation_split', 'm_orientation_split_lo', 'm_orientation_split_hi']);
    expect(doc.rows).toEqual([
      { map: 'a', m_classic: 0.7, m_classic_lo: 0.3968, m_classic_hi: 0.8922, m_orientation_split: 0.9, m_orientation_split_lo: null, m_orientation_split_hi: null },
      { map: 'b', m_classic: 0.5, m_classic_lo: 0.2, m_classic_hi: 0.8, m_orientation_split: null, m_orientation_split_lo: null, m_orientation_split_hi: null },
    ]);
  });

  it('writes "x [lo, hi]" in Markdown, bounds one digit finer, and keeps the bold best value', () => {
    const lines = toMarkdown(table).split('\n');
    expect(lines.slice(4, 6)).toEqual([
      '| a | 0.70 \\[0.397, 0.892\\] | **0.90 \\[interval not stored\\]** |',
      '| b | **0.50 \\[0.200, 0.800\\]** | – |',
    ]);
  });

  it('writes "x [lo, hi]" in LaTeX with brackets braced', () => {
    const tex = toLatex(table);
    expect(tex).toContain('a & 0.70 {[}0.397, 0.892{]} & \\textbf{0.90 {[}interval not stored{]}} \\\\');
    expect(tex).toContain('b & \\textbf{0.50 {[}0.200, 0.800{]}} & – \\\\');
  });

  it('writes the math signs of the interval methods as LaTeX math (pdflatex\'s utf8 input knows no −, √, ≥, ≤)', () => {
    expect(latexEscape('mean ± t(0.975, n−1)·s/√n, n ≥ 2, ≤ 1')).toBe('mean ± t(0.975, n$-$1)·s/$\\surd$n, n $\\geq$ 2, $\\leq$ 1');
  });

  it('leaves tables without intervals as they were', () => {
    const plain: ExportTable = { ...table, intervals: undefined };
    expect(withIntervalColumns(plain)).toBe(plain);
    expect(displayWithInterval(plain, 0, 1)).toBe('0.70');
    expect(toCsv(plain).split('\r\n')[1]).toBe('Map,classic,orientation-split');
  });
});
