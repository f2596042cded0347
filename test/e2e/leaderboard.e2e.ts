/**
 * The leaderboard in Chromium: a visitor browses board rows (validated plans submitted through
 * the API beforehand) and opens a shared link with its view; a researcher submits a valid and an
 * invalid plan in the form and sees the figures or the first violation; an author downloads the
 * LaTeX export (with its provenance lines; the wide default view compiled by pdflatex within the text width)
 * and a chart as PNG and SVG (checked by their file contents and signatures).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import type { InstanceSetDetail } from '@shared/instance-sets';
import { DEFAULT_ENTRY_COLUMNS } from '@shared/leaderboards';
import { signInAs, type SignedInClient } from '../../api/src/dev/sign-in-as';
import { PAPER_ENTRY_COLUMNS } from '../../api/src/exports/paper-columns';
import { TINY_MAP, TINY_SCEN } from '../integration/leaderboard-support';
import { axeViolations, describeFindings } from './support/axe';
import { launchBrowser, type E2eBrowser } from './support/browser';
import { focusAgainst, focusedDescription, isFocused, tabUntil } from './support/keyboard';
import { watchNetwork, type NetworkWatch } from './support/network-watch';
import { bootServer, type E2eServer } from './support/server';
import { demoIdentity, signInThroughUi } from './support/sign-in';

jest.setTimeout(60_000);

const hasPdflatex = spawnSync('pdflatex', ['--version']).status === 0;

/** Compiles a LaTeX export in a plain article (text width 345 pt) with the packages its first line names; the log's overfull boxes. */
function compileInArticle(tex: string): { status: number | null; overfull: string[]; out: string } {
  const packages = /\\usepackage\{([^}]*)\}/.exec(tex.split('\n')[0])?.[1] ?? '';
  const dir = mkdtempSync(join(tmpdir(), 'qt-e2e-latex-'));
  try {
    writeFileSync(join(dir, 'table.tex'), `\\documentclass{article}\n\\usepackage[T1]{fontenc}\n\\usepackage[utf8]{inputenc}\n\\usepackage{${packages}}\n\\begin{document}\n${tex}\\end{document}\n`);
    const pass = () => spawnSync('pdflatex', ['-no-shell-escape', '-interaction=nonstopmode', '-halt-on-error', 'table.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
    let run = pass();
    if (run.status === 0) run = pass();
    return { status: run.status, overfull: run.stdout.split('\n').filter((l) => /^Overfull \\[hv]box/.test(l)), out: run.status === 0 ? '' : run.stdout.slice(-1500) };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const researcher = demoIdentity('researcher');
const solver = { name: 'Paper planner', version: '0.9' };

describe('leaderboard in the browser', () => {
  let server: E2eServer;
  let browser: E2eBrowser;
  let page: Page;
  let network: NetworkWatch;
  let scenarioId: number;
  const pageErrors: string[] = [];

  async function seedBoard(client: SignedInClient): Promise<void> {
    const created = await client.request('/api/instance-sets', { method: 'POST', body: JSON.stringify({ name: 'Board e2e', visibility: 'public', description: 'e2e', source: 'made in a test' }) });
    const set = (await created.json()) as { id: number };
    const form = new FormData();
    form.append('files', new Blob([TINY_MAP]), 'tiny.map');
    form.append('files', new Blob([TINY_SCEN]), 'tiny-a.scen');
    const up = await client.request(`/api/instance-sets/${set.id}/files`, { method: 'POST', body: form });
    if (up.status !== 201) throw new Error(`upload: ${up.status} ${await up.text()}`);
    const detail = (await (await client.request(`/api/instance-sets/${set.id}`)).json()) as InstanceSetDetail;
    scenarioId = detail.scenarios[0].id;
    const paths = '(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n';
    for (const [model, extra] of [['classic', {}], ['k-robust', { k: 1 }], ['uniform-duration', {}]] as const) {
      const res = await client.request('/api/submissions', { method: 'POST', body: JSON.stringify({ format: 'text', text: paths, model, ...extra, instance: { scenarioId, agents: 2 }, solver }) });
      if (res.status !== 201) throw new Error(`submit ${model}: ${res.status} ${await res.text()}`);
    }
  }

  beforeAll(async () => {
    server = await bootServer();
    await seedBoard(await signInAs(server.url, 'tobiah-venkat'));
    browser = await launchBrowser();
    page = browser.page;
    network = watchNetwork(page);
    page.on('pageerror', (err) => pageErrors.push(err.message));
  }, 300_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  it('shows a visitor the board rows, sorts on the server and keeps the view in the URL', async () => {
    await page.goto(`${server.url}/leaderboards`);
    await page.locator('.ag-row').first().waitFor();
    await page.waitForFunction(() => document.querySelectorAll('.ag-row').length === 3);
    const models = await page.locator('.ag-cell[col-id=model]').allInnerTexts();
    expect([...models].sort()).toEqual(['classic', 'k-robust', 'uniform-duration']);
    expect(await page.locator('.ag-cell[col-id=socSteps]').allInnerTexts()).toEqual(['4', '4', '4']);
    // Numbers align right (the column type's cell class needs AG Grid's CellStyleModule).
    expect(await page.locator('.ag-cell[col-id=socSteps]').first().evaluate((e) => getComputedStyle(e).textAlign)).toBe('right');
    expect(await page.getByText('Simulation is no safety assessment').first().isVisible()).toBe(true);

    await page.locator('.ag-header-cell[col-id=model]').click();
    await page.waitForURL(/sort=model/);
    await page.waitForFunction(() => [...document.querySelectorAll('.ag-cell[col-id=model]')].map((e) => e.textContent?.trim()).join() === 'classic,k-robust,uniform-duration');
  });

  it('opens a shared link with its columns, sort and filter', async () => {
    await page.goto(`${server.url}/leaderboards?cols=model,variant,socSteps,source&model.in=k-robust`);
    await page.waitForFunction(() => document.querySelectorAll('.ag-row').length === 1);
    // The pinned Replay and History columns lead for everyone, visitors included (issue 14, item 6; issue 16, item 5); then the shared columns in order.
    expect(await page.locator('.ag-header-cell[col-id]').evaluateAll((els) => els.map((e) => e.getAttribute('col-id')))).toEqual(['__replay', '__history', 'model', 'variant', 'socSteps', 'source']);
    expect(await page.locator('.ag-cell[col-id=variant]').innerText()).toBe('k=1');
    expect(await page.locator('.ag-cell[col-id=source]').innerText()).toBe('submitted');
  });

  it('lets a researcher submit a valid plan and shows the first violation of an invalid one', async () => {
    await signInThroughUi(page, server.url, researcher);
    await page.goto(`${server.url}/leaderboards/submit`);
    // The instance is picked from lists, not by its id (issue 14, item 4).
    for (const [field, option] of [['Instance set', /^Board e2e/], ['Map', /^tiny\.map/], ['Scenario', /^tiny-a\.scen/]] as const) {
      await page.getByRole('combobox', { name: field }).click();
      await page.getByRole('option', { name: option }).click();
    }
    await page.getByLabel('Agents').fill('3');
    await page.getByRole('combobox', { name: 'Robot profile' }).waitFor();
    await page.getByLabel('Solver name').fill('Hand planner');
    await page.getByLabel('Solver version').fill('1');
    await page.getByLabel('Plan', { exact: true }).fill('(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n(4,3) (4,2) (4,1) (4,0)\n');
    await page.getByRole('button', { name: 'Check and submit' }).click();
    const accepted = page.getByRole('status', { name: 'Plan accepted' });
    await accepted.waitFor();
    // Hand-worked: costs 2 + 2 + 3.
    expect(await accepted.locator('[data-field=soc]').innerText()).toBe('7');

    await page.getByLabel('Plan', { exact: true }).fill('(0,0) (1,0) (2,0)\n(2,2) (2,1) (2,0) (1,0) (0,0) (0,1) (0,2)\n(4,3) (4,2) (4,1) (4,0)\n');
    await page.getByRole('button', { name: 'Check and submit' }).click();
    const rejected = page.getByRole('alert', { name: 'Plan rejected' });
    await rejected.waitFor();
    expect(await rejected.locator('[data-field=agents]').innerText()).toBe('0, 1');
    expect(await rejected.locator('[data-field=time]').innerText()).toBe('2');
    expect(await rejected.locator('[data-field=cell]').innerText()).toBe('(2, 0)');
    expect(await rejected.getByText('Nothing was stored.').isVisible()).toBe(true);

    // The accepted plan is on the board; its Replay link opens it in the plan viewer, replayed on the server.
    await page.goto(`${server.url}/leaderboards?cols=model,agents,socSteps,source&agents.eq=3`);
    await page.waitForFunction(() => document.querySelectorAll('.ag-row').length >= 1);
    await page.getByRole('link', { name: /^Replay result \d+$/ }).first().click();
    await page.waitForURL(/\/plans\/view\?result=\d+$/);
    await page.locator('.source').filter({ hasText: /3 agents · stored result \d+$/ }).waitFor({ timeout: 30_000 });
    expect(await page.locator('article.pane [data-metric="success-rate"] dd').first().innerText()).toMatch(/^\d+%$/);
  });

  it('lets an author download the LaTeX table and a chart as PNG and SVG', async () => {
    await page.goto(`${server.url}/leaderboards?layout=compare`);
    await page.locator('.ag-row').first().waitFor();
    const [latex] = await Promise.all([page.waitForEvent('download'), page.locator('a[data-export=latex]').click()]);
    expect(latex.suggestedFilename()).toBe('quarterturn-leaderboard.tex');
    const tex = await readFile(await latex.path(), 'utf8');
    expect(tex).toContain('\\toprule');
    expect(tex).toContain('\\textbf{');
    // Provenance comment lines (issue 14, item 9).
    expect(tex).toMatch(/^% hub version: /m);
    expect(tex).toMatch(/^% map Board e2e \/ tiny\.map: sha256 [0-9a-f]{64}$/m);

    // The wide default board view (every default column) fits the text width of a plain article (issue 14, item 8).
    await page.goto(`${server.url}/leaderboards`);
    await page.locator('.ag-row').first().waitFor();
    // The default columns: a 12-column paper table (api/src/exports/paper-columns.ts), plus a Robot profile column when rows mix profiles.
    const [paper] = await Promise.all([page.waitForEvent('download'), page.locator('a[data-export=latex]').click()]);
    const paperTex = await readFile(await paper.path(), 'utf8');
    const paperCols = (/\\begin\{tabular\}\{([lr]+)\}/.exec(paperTex)?.[1] ?? '').length;
    expect([PAPER_ENTRY_COLUMNS.length, PAPER_ENTRY_COLUMNS.length + 1]).toContain(paperCols);
    if (hasPdflatex) expect(compileInArticle(paperTex).overfull).toEqual([]);
    // Every default column on request ("LaTeX, all columns").
    const [wide] = await Promise.all([page.waitForEvent('download'), page.locator('a[data-export=latex-shown]').click()]);
    const wideTex = await readFile(await wide.path(), 'utf8');
    expect((/\\begin\{tabular\}\{([lr]+)\}/.exec(wideTex)?.[1] ?? '').length).toBeGreaterThanOrEqual(DEFAULT_ENTRY_COLUMNS.length);
    if (hasPdflatex) {
      const run = compileInArticle(wideTex);
      expect({ status: run.status, out: run.out }).toEqual({ status: 0, out: '' });
      expect(run.overfull).toEqual([]);
    }

    const chart = page.locator('figure[data-chart=success]');
    await chart.locator('canvas').waitFor();
    const [png] = await Promise.all([page.waitForEvent('download'), chart.getByRole('button', { name: 'Download PNG' }).click()]);
    expect(png.suggestedFilename()).toBe('quarterturn-success.png');
    // PNG signature (ISO/IEC 15948 §5.2): 89 50 4E 47 0D 0A 1A 0A.
    expect((await readFile(await png.path())).subarray(0, 8).toString('hex')).toBe('89504e470d0a1a0a');

    const [svg] = await Promise.all([page.waitForEvent('download'), chart.getByRole('button', { name: 'Download SVG' }).click()]);
    const svgText = await readFile(await svg.path(), 'utf8');
    expect(svgText.startsWith('<svg')).toBe(true);
    expect(svgText).toContain('Robot profile');
  });

  describe('by keyboard alone (issue 18)', () => {
    const inGrid = '.ag-root-wrapper, .ag-root-wrapper *';

    it('leaves the grid with one Tab either way, and its skip link leads past it to the charts', async () => {
      await page.goto(`${server.url}/leaderboards`);
      await page.locator('.ag-row').first().waitFor();
      await tabUntil(page, inGrid, 60);
      // Into the rows with the arrow keys (the grid's own navigation).
      await page.keyboard.press('ArrowDown');
      expect(await isFocused(page, '.ag-cell')).toBe(true);
      await page.keyboard.press('ArrowRight');
      expect(await isFocused(page, '.ag-cell')).toBe(true);

      await page.keyboard.press('Tab');
      expect({ focus: await focusedDescription(page), against: await focusAgainst(page, 'ag-grid-angular') }).toMatchObject({ against: 'after' });
      // Back in with Shift+Tab (to the cell last focused), and out before the grid with one more.
      await page.keyboard.press('Shift+Tab');
      expect(await focusAgainst(page, 'ag-grid-angular')).toBe('inside');
      await page.keyboard.press('Shift+Tab');
      expect(await focusAgainst(page, 'ag-grid-angular')).toBe('before');

      // Just before the grid: its skip link, visible while it holds focus.
      expect(await isFocused(page, 'a.qt-skip-link[href="#after-board-grid"]')).toBe(true);
      const box = await page.locator('a[href="#after-board-grid"]').boundingBox();
      expect(box?.width).toBeGreaterThan(20);
      await page.keyboard.press('Enter');
      expect(await isFocused(page, '#after-board-grid')).toBe(true);
      // The summary and the charts' download buttons are a few Tabs away.
      const presses = await tabUntil(page, 'figure[data-chart] button', 40);
      expect(presses).toBeLessThan(40);
    });

    it('follows the Replay link of the focused cell on Enter', async () => {
      await page.goto(`${server.url}/leaderboards`);
      await page.locator('.ag-row').first().waitFor();
      await tabUntil(page, inGrid, 60);
      await page.keyboard.press('ArrowDown');
      // To the start of the row: the pinned Replay column.
      await page.keyboard.press('Control+ArrowLeft');
      expect({ focus: await focusedDescription(page), isReplay: await isFocused(page, '.ag-cell[col-id=__replay]') }).toMatchObject({ isReplay: true });
      await page.keyboard.press('Enter');
      await page.waitForURL(/\/plans\/view\?result=\d+$/);
      await page.locator('article.pane').first().waitFor({ timeout: 30_000 });
    });

    it('follows the History link of the focused cell on Enter to every stored result of the row (issue 16, item 5)', async () => {
      await page.goto(`${server.url}/leaderboards?cols=model,variant,socSteps&model.in=k-robust`);
      await page.waitForFunction(() => document.querySelectorAll('.ag-row').length === 1);
      await tabUntil(page, inGrid, 60);
      await page.keyboard.press('ArrowDown');
      await page.keyboard.press('Control+ArrowLeft');
      await page.keyboard.press('ArrowRight');
      expect({ focus: await focusedDescription(page), isHistory: await isFocused(page, '.ag-cell[col-id=__history]') }).toMatchObject({ isHistory: true });
      await page.keyboard.press('Enter');
      await page.waitForURL(/\/leaderboards\/history\?scenarioId=\d+&agents=\d+&model=k-robust&variant=k(%3D|=)1&profile=[0-9a-f]{16}$/);
      await page.locator('table.mat-mdc-table tr.mat-mdc-row').first().waitFor({ timeout: 20_000 });
      expect(await page.locator('[data-key=model]').innerText()).toBe('k-robust (k=1)');
      // Every stored result of the row, the one on the board marked; units in the headers.
      expect(await page.locator('[data-testid=on-board]').count()).toBe(1);
      expect(await page.locator('th', { hasText: 'Sum-of-costs (steps)' }).count()).toBe(1);
      const findings = await axeViolations(page);
      expect(describeFindings('/leaderboards/history', findings)).toEqual([]);

      // On to the row's instance set, whose files download as one zip (issue 16, item 6).
      await page.locator('[data-key=instance] a').click();
      await page.waitForURL(/\/instance-sets\/\d+$/);
      const [zip] = await Promise.all([page.waitForEvent('download'), page.locator('a[data-download=archive]').click()]);
      expect(zip.suggestedFilename()).toMatch(/\.zip$/);
      expect((await readFile(await zip.path())).subarray(0, 4).toString('latin1')).toBe('PK\u0003\u0004');
    });

    it('downloads an export from its link', async () => {
      await page.goto(`${server.url}/leaderboards`);
      await page.locator('.ag-row').first().waitFor();
      await tabUntil(page, 'a[data-export=csv]', 60);
      const [csv] = await Promise.all([page.waitForEvent('download'), page.keyboard.press('Enter')]);
      expect(csv.suggestedFilename()).toBe('quarterturn-leaderboard.csv');
      expect((await readFile(await csv.path(), 'utf8')).length).toBeGreaterThan(20);
    });
  });

  it('never called a host other than loopback and raised no page errors', () => {
    expect(network.outside).toEqual([]);
    expect(pageErrors).toEqual([]);
  });
});
