/**
 * LaTeX that fits a paper (issue 14, item 8): a wide table (every board column) and long ones
 * (101 rows) compiled by pdflatex in a plain article, whose text width is 345 pt, with no
 * overfull box; a long table is a longtable over more than one page. The mixed-profile column
 * and the caution as a comment line are checked on the text.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { latexHeader, LONG_TABLE_ROWS, toLatex } from './exports-latex';
import { toMarkdown } from './exports-markdown';
import { withShortProfiles, type ExportCell, type ExportTable } from './exports-table';
import { DEFAULT_ENTRY_COLUMNS, ENTRY_COLUMNS, profileLabel } from './leaderboards';

const PROFILE_A = { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0.1 };
const PROFILE_B = { ...PROFILE_A, quarterTurnMs: 900, timingJitter: 0 };

/** A board table of `rows` rows over the given columns, with values as wide as real ones. */
function boardTable(rows: number, columnIds: readonly string[]): ExportTable {
  const columns = ENTRY_COLUMNS.filter((c) => columnIds.includes(c.id));
  const text: Readonly<Record<string, (i: number) => string>> = {
    map: () => 'random-32-32-20.map', scenario: (i) => `random-32-32-20-even-${(i % 25) + 1}.scen`, model: () => 'orientation-split',
    variant: (i) => (i % 3 === 0 ? 'k=1' : ''), status: () => 'solved', executableAtNominal: () => 'not checked', source: () => 'sweep',
    solver: () => 'Quarterturn CBS', profile: (i) => profileLabel(i % 2 === 0 ? PROFILE_A : PROFILE_B),
  };
  return {
    caption: 'Best result per instance and plan model; 50 % of "x" & more.',
    columns,
    rows: Array.from({ length: rows }, (_, i) => columns.map((c): ExportCell => (c.kind === 'number' ? 123456.789 + i : text[c.id]?.(i) ?? 'text'))),
    compareColumns: [],
    caution: 'Simulation is no safety assessment.',
  };
}

const hasPdflatex = spawnSync('pdflatex', ['--version']).status === 0;

/** Compiles `tex` twice (longtable settles its widths) in a plain article with the packages its first line names. */
function compile(tex: string): { status: number | null; overfull: string[]; pages: number; out: string } {
  const packages = /\\usepackage\{([^}]*)\}/.exec(tex.split('\n')[0])?.[1] ?? '';
  const dir = mkdtempSync(join(tmpdir(), 'qt-latex-layout-'));
  try {
    writeFileSync(join(dir, 'table.tex'), `\\documentclass{article}\n\\usepackage[T1]{fontenc}\n\\usepackage[utf8]{inputenc}\n\\usepackage{${packages}}\n\\begin{document}\n${tex}\\end{document}\n`);
    const pass = () => spawnSync('pdflatex', ['-no-shell-escape', '-interaction=nonstopmode', '-halt-on-error', 'table.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
    let run = pass();
    if (run.status === 0) run = pass();
    const log = readFileSync(join(dir, 'table.log'), 'utf8');
    return {
      status: run.status,
      overfull: log.split('\n').filter((l) => /^Overfull \\[hv]box/.test(l)),
      pages: Number(/Output written on table\.pdf \((\d+) pages?/.exec(log)?.[1] ?? 0),
      out: run.status === 0 ? '' : run.stdout.slice(-1500),
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe('LaTeX layout', () => {
  it('wraps header labels onto stacked lines with the unit, keeping "95 %" together and breaking long words after a hyphen', () => {
    expect(latexHeader('Map', undefined, false)).toBe('Map');
    expect(latexHeader('Turn-inclusive makespan', 'ms', true)).toBe('\\begin{tabular}[b]{@{}r@{}}Turn-\\\\inclusive\\\\makespan\\\\(ms)\\end{tabular}');
    expect(latexHeader('Sum-of-costs', 'steps', true)).toBe('\\begin{tabular}[b]{@{}r@{}}Sum-of-\\\\costs\\\\(steps)\\end{tabular}');
    expect(latexHeader('Execution success rate, open-loop, 95 % CI low', undefined, true))
      .toBe('\\begin{tabular}[b]{@{}r@{}}Execution\\\\success\\\\rate,\\\\open-loop,\\\\95 \\% CI\\\\low\\end{tabular}');
  });

  it(`is a table float up to ${LONG_TABLE_ROWS} rows and a longtable with a repeated header above`, () => {
    const short = toLatex(boardTable(LONG_TABLE_ROWS, ['map', 'agents', 'socSteps']));
    expect(short.split('\n')[0]).toBe('% Exported from Quarterturn; needs \\usepackage{booktabs,graphicx} in the preamble.');
    expect(short).toContain('\\begin{table}[htbp]');
    expect(short).not.toContain('longtable');
    const long = toLatex(boardTable(LONG_TABLE_ROWS + 1, ['map', 'agents', 'socSteps']));
    expect(long.split('\n')[0]).toBe('% Exported from Quarterturn; needs \\usepackage{booktabs,longtable,array,graphicx} in the preamble.');
    expect(long).not.toContain('\\begin{table}');
    // Caption inside the longtable, header on the first page and again on every other page.
    expect(long.indexOf('\\caption{')).toBeGreaterThan(long.indexOf('\\begin{longtable}'));
    expect(long.slice(long.indexOf('\\begin{longtable}')).match(/\\QTHead/g)).toHaveLength(2);
    expect(long.indexOf('\\endfirsthead')).toBeLessThan(long.indexOf('\\endhead'));
    // One row per line in the rows macro.
    const rows = long.slice(long.indexOf('\\newcommand\\QTRows{%\n') + '\\newcommand\\QTRows{%\n'.length, long.indexOf('\n}\n\\sbox')).split('\n');
    expect(rows).toHaveLength(LONG_TABLE_ROWS + 1);
  });

  it('writes the caution as a comment line, not in the caption', () => {
    const tex = toLatex(boardTable(3, ['map', 'successOpenLoop']));
    expect(tex.split('\n')).toContain('% Caution: Simulation is no safety assessment.');
    expect(/\\caption\{[^\n]*\}/.exec(tex)?.[0]).not.toContain('Simulation');
  });

  it('shows only the differing profile parameters per row when the rows mix profiles, the shared ones in the caption', () => {
    const table = withShortProfiles(boardTable(4, ['map', 'profile', 'socSteps']));
    expect(table.rows.map((r) => r[1])).toEqual(['quarter turn 600 ms, jitter 0.1', 'quarter turn 900 ms, jitter 0', 'quarter turn 600 ms, jitter 0.1', 'quarter turn 900 ms, jitter 0']);
    expect(table.caption).toContain('Robot profile column: only the parameters that differ between rows; every row has forward 1000 ms, wait 1000 ms, pitch 1000 mm, diameter 700 mm.');
    expect(toMarkdown(boardTable(4, ['map', 'profile'])).split('\n')).toContain('| random-32-32-20.map | quarter turn 900 ms, jitter 0 |');
    // One profile: the full label stays.
    const one = boardTable(1, ['map', 'profile']);
    expect(withShortProfiles(one)).toBe(one);
  });

  it('writes keys P1, P2 spelt out in the caption when several parameters differ (a profile cell was 90 characters wide)', () => {
    const third = { ...PROFILE_A, forwardMs: 800, waitMs: 800, cellPitchMm: 1200, robotDiameterMm: 600, quarterTurnMs: 900, timingJitter: 0 };
    const base = boardTable(4, ['map', 'profile', 'socSteps']);
    const j = 1;
    const mixed: ExportTable = { ...base, rows: base.rows.map((r, i) => r.map((v, c) => (c === j ? profileLabel(i % 2 === 0 ? PROFILE_A : third) : v))) };
    const table = withShortProfiles(mixed);
    expect(table.rows.map((r) => r[j])).toEqual(['P1', 'P2', 'P1', 'P2']);
    expect(table.caption).toContain('Robot profiles: P1 = forward 1000 ms, quarter turn 600 ms, wait 1000 ms, pitch 1000 mm, diameter 700 mm, jitter 0.1; P2 = forward 800 ms, quarter turn 900 ms, wait 800 ms, pitch 1200 mm, diameter 600 mm, jitter 0.');
  });

  (hasPdflatex ? it.each : it.skip.each)([
    ['a wide table: every board column, 20 rows', 20, ENTRY_COLUMNS.map((c) => c.id), 1],
    ['a long table: 101 rows of six columns, over several pages', 101, ['map', 'scenario', 'agents', 'model', 'socSteps', 'tiMakespanMs'], 2],
    ['a long and wide table: 101 rows of the default board columns', 101, DEFAULT_ENTRY_COLUMNS, 1],
    ['a long table of every board column and mixed profiles', 101, ENTRY_COLUMNS.map((c) => c.id), 1],
  ] as const)(`compiles %s within the text width${hasPdflatex ? '' : ' (skipped: pdflatex is not installed)'}`, (_name, rows, columns, minPages) => {
    const table = boardTable(rows, columns);
    expect(table.columns.length).toBe(columns.length);
    const run = compile(toLatex(table));
    expect({ status: run.status, out: run.out }).toEqual({ status: 0, out: '' });
    expect(run.overfull).toEqual([]);
    expect(run.pages).toBeGreaterThanOrEqual(minPages);
  }, 120_000);
});
