/**
 * Hostile names in exports (issue 13, items 2 and 3): map names come from uploaded file names and
 * solver names from submitted plans, so every exported string is escaped for its format. CSV is
 * checked cell by cell, Markdown is rendered by marked (a GFM renderer) and LaTeX is compiled by
 * pdflatex, and the typeset text is read back from the page boxes pdflatex logs.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { csvField, toCsv } from './exports-csv';
import { latexEscape, toLatex } from './exports-latex';
import { markdownCell, toMarkdown } from './exports-markdown';
import { provenanceLines, type ExportProvenance } from './exports-provenance';
import type { ExportTable } from './exports-table';

/** Names an attacker can choose, one per row, each with what a reader must see (control characters as spaces). */
const HOSTILE: readonly (readonly [name: string, shown: string])[] = [
  ['\\input{/etc/passwd}', '\\input{/etc/passwd}'],
  ['\\immediate\\write18{touch /tmp/qt-pwned}', '\\immediate\\write18{touch /tmp/qt-pwned}'],
  ['x}} \\end{tabular} {{', 'x}} \\end{tabular} {{'],
  ['100% of $x^2$ & #1 _a_ ~b', '100% of $x^2$ & #1 _a_ ~b'],
  ['first line\n\\end{table}\n\nsecond', 'first line \\end{table} second'],
  ['[2cm] bracket after a row end', '[2cm] bracket after a row end'],
  ['*starred', '*starred'],
  ['bell\u0007 nul\u0000 esc\u001b[31m cr\rlf\u2028sep', 'bell nul esc [31m cr lf sep'],
  ['a | b \\| c', 'a | b \\| c'],
  ['solver\r# injected heading', 'solver # injected heading'],
  ['<img src=x onerror=alert(1)> &lt;b&gt;', '<img src=x onerror=alert(1)> &lt;b&gt;'],
  ['`code` **bold** _em_ ~~del~~ [link](javascript:alert(1)) ![i](x)', '`code` **bold** _em_ ~~del~~ [link](javascript:alert(1)) ![i](x)'],
];

const hostileTable: ExportTable = {
  caption: 'Filters: map has \\input{/etc/passwd}\n\n} \\caption{x % <b>end</b>\r# heading',
  columns: [
    { id: 'map', label: 'Map', kind: 'text' },
    { id: 'solver', label: 'Solver', kind: 'text' },
    { id: 'soc', label: 'Sum-of-costs', kind: 'number', digits: 0 },
  ],
  rows: HOSTILE.map(([name], i) => [name, name, i]),
  compareColumns: [],
};

/** Provenance whose names (set, file, profile label) are hostile in every format (issue 14, item 9). */
const hostileProvenance: ExportProvenance = {
  hub: { version: '0.1.0', commit: 'abc' },
  exportedAt: '2026-12-04T00:00:00.000Z',
  results: 2,
  sweeps: [3, 4],
  submissions: [],
  seeds: [1, 2],
  profiles: [{ hash: '0123456789abcdef', label: 'fwd\n# smuggled,=HYPERLINK("x") --> <img src=x onerror=alert(1)>', parameters: { forwardMs: 1 } }],
  maps: [{ set: 'set\r\n\\input{/etc/passwd}\n--><script>x</script>', name: 'm,@SUM(A1),"q', sha256: 'a'.repeat(64) }],
  scenarios: [{ set: 'end --!> <!-- again', name: '\u2028\\end{document}', sha256: 'b'.repeat(64) }, { set: 'semi', name: 'a;=1+1;@x', sha256: 'c'.repeat(64) }],
};
const withProvenance: ExportTable = { ...hostileTable, provenance: hostileProvenance, caution: 'Careful\n-->\n=1+1' };

/** Whitespace runs as one space, ends trimmed: how TeX and HTML show text. */
const squash = (s: string) => s.replace(/\s+/g, ' ').trim();

describe('CSV formula injection', () => {
  // OWASP, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): cells starting with
  // = + - @ tab or carriage return are read as formulas; prefix a single quote and quote per RFC 4180.
  it.each([
    ['=HYPERLINK("http://x","y")', '"\'=HYPERLINK(""http://x"",""y"")"'],
    ['+1+2', "'+1+2"],
    ['-2+3', "'-2+3"],
    ['@SUM(A1:A9)', "'@SUM(A1:A9)"],
    ['\tx', "'\tx"],
    ['\rx', '"\'\rx"'],
    ['=1,2', '"\'=1,2"'],
    // Where a spreadsheet's locale lists with semicolons it splits there: quoted, so "=1+1" stays inside the cell.
    ['a;=1+1', '"a;=1+1"'],
  ])('neutralises the text cell %j', (text, field) => {
    expect(csvField(text)).toBe(field);
  });

  it('leaves plain text and numbers alone, negative numbers included', () => {
    expect(csvField('room-32-32-4.map')).toBe('room-32-32-4.map');
    expect(csvField(-5)).toBe('-5');
    expect(csvField(-0.25)).toBe('-0.25');
  });

  it('writes numbers of number columns as numbers and neutralises only text cells', () => {
    const table: ExportTable = {
      caption: '',
      columns: [{ id: 'solver', label: 'Solver', kind: 'text' }, { id: 'gap', label: 'Gap', kind: 'number' }, { id: 'delta', label: 'Delta', kind: 'number' }],
      rows: [['=cmd|\' /C calc\'!A0', -3, '-12.5']],
      compareColumns: [],
    };
    expect(toCsv(table).split('\r\n')[1]).toBe(`'=cmd|' /C calc'!A0,-3,-12.5`);
  });

  it('starts no cell of a hostile table with a formula character', () => {
    const lines = toCsv(hostileTable);
    // Split fields per RFC 4180 (quoted fields may hold commas, quotes and line breaks).
    const fields = [...lines.matchAll(/(?:^|,|\r\n)("(?:[^"]|"")*"|[^,\r\n]*)/g)].map((m) => m[1].replace(/^"(.*)"$/s, '$1').replace(/""/g, '"'));
    for (const f of fields) expect(f).not.toMatch(/^[=+\-@\t\r]/);
  });
});

describe('provenance injection', () => {
  const commentCount = provenanceLines(hostileProvenance).length + 2;

  it('keeps every CSV comment on its own # line, with no piece a spreadsheet would read as a formula', () => {
    const lines = toCsv(withProvenance).split('\r\n');
    expect(lines.slice(0, commentCount).every((l) => l.startsWith('# '))).toBe(true);
    expect(lines[commentCount]).toBe('Map,Solver,Sum-of-costs');
    for (const l of lines.slice(0, commentCount)) for (const piece of l.split(/[,;]/).slice(1)) expect(piece).not.toMatch(/^[=+\-@"\t\r]/);
    expect(lines).toContain('# robot profile 0123456789abcdef: fwd # smuggled,\'=HYPERLINK("x") --> <img src=x onerror=alert(1)> (forwardMs=1)');
  });

  it('keeps the Markdown provenance inside one HTML comment, which no name can close', () => {
    const md = toMarkdown(withProvenance);
    const end = md.indexOf('\n-->\n');
    expect(md.startsWith('<!--\n')).toBe(true);
    expect(md.slice(5, end)).not.toContain('--');
    expect(md.slice(end + 5)).not.toMatch(/-->|<!--/);
    const run = spawnSync(process.execPath, [require.resolve('marked/bin/marked'), '--gfm'], { input: md, encoding: 'utf8' });
    expect(run.status).toBe(0);
    const visible = run.stdout.replace(/<!--[\s\S]*?-->/g, '');
    expect(visible).not.toMatch(/<(img|script|h\d)\b/);
    expect(visible).not.toContain('smuggled');
    // The caution is a paragraph below the table, escaped like cells.
    expect(visible).toContain('<em>Careful --&gt; =1+1</em>');
  });

  it('writes the LaTeX provenance as % lines, one per entry', () => {
    const tex = toLatex(withProvenance).split('\n');
    const start = tex.indexOf('% Provenance (Quarterturn export)');
    expect(start).toBeGreaterThan(0);
    const n = provenanceLines(hostileProvenance).length;
    expect(tex.slice(start, start + n).every((l) => l.startsWith('% '))).toBe(true);
    expect(tex[start + n]).toBe('\\begin{table}[htbp]');
  });
});

describe('Markdown injection', () => {
  it('escapes pipes, backslashes, emphasis, code, links and HTML, and folds control characters', () => {
    expect(markdownCell('a|b\\c')).toBe('a\\|b\\\\c');
    expect(markdownCell('x\r# y\nz\u0000w')).toBe('x \\# y z w');
    expect(markdownCell('<b>&amp;</b>')).toBe('&lt;b&gt;&amp;amp;&lt;/b&gt;');
    expect(markdownCell('`a` *b* _c_ ~d~ [e](f)')).toBe('\\`a\\` \\*b\\* \\_c\\_ \\~d\\~ \\[e\\](f)');
  });

  it('renders with marked as one table row per row, each cell showing the name literally', () => {
    const md = toMarkdown(hostileTable);
    // Outside check: marked (GFM) renders the file the way a reader's viewer would.
    const run = spawnSync(process.execPath, [require.resolve('marked/bin/marked'), '--gfm'], { input: md, encoding: 'utf8' });
    expect(run.status).toBe(0);
    const html = run.stdout;
    expect(html).not.toMatch(/<(h\d|img|script|code|em|del|a|pre|blockquote|ul|ol)\b/);
    const rows = [...html.matchAll(/<tr>([\s\S]*?)<\/tr>/g)].map((m) => [...m[1].matchAll(/<t[dh][^>]*>([\s\S]*?)<\/t[dh]>/g)].map((c) => c[1]));
    expect(rows).toHaveLength(HOSTILE.length + 1);
    const text = (cell: string) => cell.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
    HOSTILE.forEach(([, shown], i) => {
      expect(rows[i + 1].map(text).map(squash)).toEqual([squash(shown), squash(shown), String(i)]);
    });
    const caption = /^<p>([\s\S]*?)<\/p>/.exec(html)?.[1] ?? '';
    expect(squash(text(caption))).toBe('Filters: map has \\input{/etc/passwd} } \\caption{x % <b>end</b> # heading');
  });
});

describe('LaTeX injection', () => {
  it('escapes all ten special characters, brackets and stars, and folds control characters and line breaks', () => {
    expect(latexEscape('a\nb\r\nc\u0000d\u2028e')).toBe('a b  c d e');
    expect(latexEscape('[x] *y')).toBe('{[}x{]} {*}y');
    expect(latexEscape('\\ { } $ & # ^ _ ~ %')).toBe('\\textbackslash{} \\{ \\} \\$ \\& \\# \\textasciicircum{} \\_ \\textasciitilde{} \\%');
  });

  it('keeps one table row per line', () => {
    const tex = toLatex(hostileTable);
    const body = tex.slice(tex.indexOf('\\midrule') + '\\midrule\n'.length, tex.indexOf('\\bottomrule')).trimEnd().split('\n');
    expect(body).toHaveLength(HOSTILE.length);
    for (const line of body) expect(line).toMatch(/ \\\\$/);
  });

  const hasPdflatex = spawnSync('pdflatex', ['--version']).status === 0;
  (hasPdflatex ? it : it.skip)('compiles with pdflatex and typesets every hostile name literally, running none of it', () => {
    const dir = mkdtempSync(join(tmpdir(), 'qt-latex-hostile-'));
    try {
      // \showoutput writes each page's boxes to the log, one glyph per line, so the typeset text can be read back.
      writeFileSync(join(dir, 'table.tex'), `\\documentclass{article}\n\\usepackage[T1]{fontenc}\n\\usepackage[utf8]{inputenc}\n\\usepackage{booktabs,graphicx}\n\\usepackage[margin=5mm,landscape]{geometry}\n\\showoutput\n\\begin{document}\n\\tiny\n${toLatex(withProvenance)}\\end{document}\n`);
      const run = spawnSync('pdflatex', ['-no-shell-escape', '-interaction=nonstopmode', '-halt-on-error', 'table.tex'], {
        cwd: dir, encoding: 'utf8', timeout: 60_000, env: { ...process.env, max_print_line: '100000' },
      });
      expect({ status: run.status, log: run.status === 0 ? '' : run.stdout.slice(-1500) }).toEqual({ status: 0, log: '' });
      const log = readFileSync(join(dir, 'table.log'), 'utf8');
      // TeX logs every file it reads as "(path"; and any \write18 attempt as "runsystem".
      expect(log).not.toContain('(/etc/passwd');
      expect(log).not.toContain('runsystem');
      const typeset = typesetText(log);
      for (const [, shown] of HOSTILE) expect(typeset).toContain(squash(shown));
      expect(typeset).toContain('Filters: map has \\input{/etc/passwd} } \\caption{x % <b>end</b> # heading');
      // The provenance and the caution are comments: nothing of them is typeset.
      expect(typeset).not.toContain('smuggled');
      expect(typeset).not.toContain('Careful');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);
});

/**
 * The text of the boxes \showoutput logs: a glyph line (`....\T1/cmr/m/n/5 x`, or `^^[ (ligature ff)`)
 * adds its character(s), interword glue a space and any other box or glue a line break.
 */
function typesetText(log: string): string {
  const lines: string[] = [];
  let line = '';
  for (const raw of log.split('\n')) {
    const glyph = /^\.+\\T1\/\S+ (.+)$/.exec(raw);
    if (glyph) {
      const lig = /\(ligature (.+)\)$/.exec(glyph[1]);
      line += lig ? lig[1] : glyph[1];
    } else if (/^\.+\\glue [\d.-]/.test(raw)) {
      line += ' ';
    } else if (/^\.+\\(hbox|vbox|glue|penalty)/.test(raw)) {
      lines.push(squash(line));
      line = '';
    }
  }
  lines.push(squash(line));
  return lines.filter((l) => l !== '').join('\n');
}
