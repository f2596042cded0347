/// <reference types="node" />
/**
 * `--following allowed|forbidden` end to end through both CLIs (issue 12, item 3) on the empty
 * 3 × 3 map of the issue: agent 0 goes (1,1) → (1,2) while agent 1 goes (0,1) → (1,1), entering
 * at a right angle the cell agent 0 leaves. Classic allows that following; the following
 * conflict (Stern et al., SoCS 2019) forbids it, so agent 1 waits one step.
 * With 400 mm robots on a 500 mm pitch (the default profile) the diameter exceeds pitch/√2 ≈ 354 mm,
 * so the allowed plan collides even at nominal times and the forbidden one does not.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

const ROOT = resolve(__dirname, '../..');
const TSX = join(ROOT, 'node_modules/.bin/tsx');
const cli = (name: 'solve' | 'execute', args: string[]) => spawnSync(TSX, [`solvers/cli/${name}.ts`, ...args], { cwd: ROOT, encoding: 'utf8' });

describe('--following on solve and execute', () => {
  let temp: string;
  let files: string[];
  beforeAll(() => {
    temp = mkdtempSync(join(tmpdir(), 'qt-following-'));
    writeFileSync(join(temp, 'empty-3-3.map'), 'type octile\nheight 3\nwidth 3\nmap\n...\n...\n...\n');
    writeFileSync(join(temp, 'corner.scen'), 'version 1\n0\tempty-3-3.map\t3\t3\t1\t1\t1\t2\t1\n0\tempty-3-3.map\t3\t3\t0\t1\t1\t1\t1\n');
    files = ['--map', join(temp, 'empty-3-3.map'), '--scen', join(temp, 'corner.scen'), '--agents', '2'];
  });
  afterAll(() => rmSync(temp, { recursive: true, force: true }));

  it('solve: forbidding following costs agent 1 one wait step (SOC 2 → 3) and is recorded in the parameters', () => {
    const allowed = JSON.parse(cli('solve', [...files, '--json']).stdout);
    const forbidden = JSON.parse(cli('solve', [...files, '--following', 'forbidden', '--json']).stdout);
    expect([allowed.status, allowed.soc, allowed.makespan]).toEqual(['solved', 2, 1]);
    expect([forbidden.status, forbidden.soc, forbidden.makespan]).toEqual(['solved', 3, 2]);
    expect(forbidden.parameters.following).toBe('forbidden');
    // Agent 1 enters (1,1) only after agent 0 has been out of it for a step.
    expect(forbidden.paths[1]).toEqual([[0, 1], [0, 1], [1, 1]]);
  });

  it('execute: the allowed plan collides open-loop at zero noise, the forbidden one does not', () => {
    const stderr: Record<string, string> = {};
    const run = (following: string) => {
      const r = cli('execute', [...files, '--following', following, '--policy', 'open-loop', '--runs', '1', '--json']);
      expect(r.status).toBe(0);
      stderr[following] = r.stderr;
      return JSON.parse(r.stdout);
    };
    const allowed = run('allowed');
    const forbidden = run('forbidden');
    // The warning of shared/following-hazard.ts comes only where the plan may contain following.
    expect(stderr.allowed).toMatch(/^execute: warning: Robots of 400 mm on a 500 mm pitch collide in right-angle following/);
    expect(stderr.forbidden).toBe('');
    expect([allowed.successRate, allowed.collisions.total, allowed.firstCollision.robots]).toEqual([0, 1, [0, 1]]);
    expect([forbidden.successRate, forbidden.collisions.total, forbidden.firstCollision]).toEqual([1, 0, null]);
    expect(forbidden.realisedMakespanMs.mean).toBe(2000);
    // Dependency gating starts the follower's move only after the leader's move out has ended: no collision, no warning.
    const gated = cli('execute', [...files, '--following', 'allowed', '--policy', 'dependency-gated', '--runs', '1', '--json']);
    expect([gated.status, gated.stderr, JSON.parse(gated.stdout).collisions.total]).toEqual([0, '', 0]);
  });
});
