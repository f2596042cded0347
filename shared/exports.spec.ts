/** The export formatters on a small hand-written table: quoting, escaping and the bold best value. */
import { toCsv, csvField } from './exports-csv';
import { toJsonExport } from './exports-json';
import { latexEscape, toLatex } from './exports-latex';
import { markdownCell, toMarkdown } from './exports-markdown';
import { bestCells, type ExportTable } from './exports-table';

const table: ExportTable = {
  caption: 'Turn-inclusive makespan 50% of "budget" & more',
  columns: [
    { id: 'map', label: 'Map', kind: 'text' },
    { id: 'm_classic', label: 'classic', kind: 'number', unit: 'ms', better: 'lower', digits: 0 },
    { id: 'm_weighted_split', label: 'weighted-split', kind: 'number', unit: 'ms', better: 'lower', digits: 0 },
  ],
  rows: [
    ['room_32 #2 & co, "east"', 5200, 4100.4],
    ['a|b\\c', null, 900],
    ['tie', 700, 700],
  ],
  compareColumns: ['m_classic', 'm_weighted_split'],
};

describe('CSV (RFC 4180)', () => {
  it('quotes fields with commas, quotes or line breaks and doubles inner quotes', () => {
    // RFC 4180 §2 rules 6 and 7.
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField('plain')).toBe('plain');
    expect(csvField(null)).toBe('');
  });

  it('writes a header with units and CRLF line ends, numbers at full precision', () => {
    expect(toCsv(table)).toBe(
      '# caption: Turn-inclusive makespan 50% of "budget" & more\r\n'
      + 'Map,classic (ms),weighted-split (ms)\r\n"room_32 #2 & co, ""east""",5200,4100.4\r\na|b\\c,,900\r\ntie,700,700\r\n',
    );
  });
});

describe('LaTeX', () => {
  it('escapes every special character once', () => {
    expect(latexEscape('a_b %c &d #e $f {g} ~h ^i \\j')).toBe(
      'a\\_b \\%c \\&d \\#e \\$f \\{g\\} \\textasciitilde{}h \\textasciicircum{}i \\textbackslash{}j',
    );
  });

  it('writes a booktabs tabular with the best model value per row in bold (ties both bold)', () => {
    const tex = toLatex(table);
    expect(tex).toContain('\\begin{tabular}{lrr}');
    expect(tex.indexOf('\\toprule')).toBeLessThan(tex.indexOf('\\midrule'));
    expect(tex.indexOf('\\midrule')).toBeLessThan(tex.indexOf('\\bottomrule'));
    expect(tex).toContain('room\\_32 \\#2 \\& co, "east" & 5200 & \\textbf{4100} \\\\');
    expect(tex).toContain('a|b\\textbackslash{}c & – & \\textbf{900} \\\\');
    expect(tex).toContain('tie & \\textbf{700} & \\textbf{700} \\\\');
    expect(tex).toContain('\\caption{Turn-inclusive makespan 50\\% of "budget" \\& more}');
  });

  it('never bolds a plan that collides at nominal times: the best executable value is bold instead', () => {
    const guarded: ExportTable = { ...table, notExecutable: [['m_weighted_split'], ['m_weighted_split'], []] };
    expect(bestCells(guarded).map((s) => [...s])).toEqual([[1], [], [1, 2]]);
    expect(bestCells({ ...guarded, bestAmong: 'all' }).map((s) => [...s])).toEqual([[2], [2], [1, 2]]);
    const tex = toLatex(guarded);
    expect(tex).toContain('room\\_32 \\#2 \\& co, "east" & \\textbf{5200} & 4100\\textsuperscript{\\dag} \\\\');
    expect(tex).toContain('a|b\\textbackslash{}c & – & 900\\textsuperscript{\\dag} \\\\');
    expect(toMarkdown(guarded)).toContain('| **5200** | 4100 † |');
    expect(toMarkdown({ ...guarded, bestAmong: 'all' })).toContain('| 5200 | **4100** † |');
  });

  it('bolds the higher value for rates', () => {
    const rates: ExportTable = { ...table, columns: table.columns.map((c) => (c.kind === 'number' ? { ...c, better: 'higher' as const } : c)) };
    expect([...bestCells(rates)[0]]).toEqual([1]);
  });
});

describe('Markdown', () => {
  it('escapes pipes and backslashes so a cell never splits the row', () => {
    expect(markdownCell('a|b\\c')).toBe('a\\|b\\\\c');
  });

  it('writes a pipe table with right-aligned numbers and the best value in bold', () => {
    const lines = toMarkdown(table).split('\n');
    expect(lines[2]).toBe('| Map | classic (ms) | weighted-split (ms) |');
    expect(lines[3]).toBe('| :--- | ---: | ---: |');
    expect(lines[5]).toBe('| a\\|b\\\\c | – | **900** |');
    // Every row has exactly as many unescaped pipes as the header.
    const pipes = (l: string) => (l.match(/(?<!\\)\|/g) ?? []).length;
    for (const l of lines.slice(2, 7)) expect(pipes(l)).toBe(4);
  });
});

describe('JSON', () => {
  it('keys each row by column id and keeps nulls and full precision', () => {
    const doc = JSON.parse(toJsonExport(table));
    expect(doc.rows[0]).toEqual({ map: 'room_32 #2 & co, "east"', m_classic: 5200, m_weighted_split: 4100.4 });
    expect(doc.rows[1].m_classic).toBeNull();
    expect(doc.columns[1]).toEqual({ id: 'm_classic', label: 'classic', unit: 'ms' });
  });
});
