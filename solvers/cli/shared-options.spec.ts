/// <reference types="node" />
/**
 * The options `solve` and `execute` share parse identically (issue 12, item 9): the parser on its
 * own, then both CLIs as a user runs them (child processes) on the open grid benchmark files
 * (benchmarks/datasets/grid-benchmarks/, read in place; Sturtevant 2012, see the dataset README).
 */
import { spawnSync } from 'node:child_process';
import { join, resolve } from 'node:path';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';
import { MAX_K } from '../models/k-robust-model';
import { DEFAULT_ROBOT_PROFILE } from '../models/heading-schedule';
import { solveModel } from '../models/solve-model';
import { loadInstance } from './load-instance';
import { SHARED_DEFAULTS, SHARED_HELP, UsageError, WEIGHTED_SPLIT_WAIT_NOTE, modelSolveOptions, parseSharedOptions } from './shared-options';

const ROOT = resolve(__dirname, '../..');
const TSX = join(ROOT, 'node_modules/.bin/tsx');
const cli = (name: 'solve' | 'execute', args: string[]) => spawnSync(TSX, [`solvers/cli/${name}.ts`, ...args], { cwd: ROOT, encoding: 'utf8' });
const MAP = join(OPEN_GRID_BENCHMARKS_DIR, 'empty-8-8.map');
const SCEN = join(OPEN_GRID_BENCHMARKS_DIR, 'empty-8-8-even-1.scen');
const base = { map: MAP, scen: SCEN, agents: '3' };

const refusal = (raw: Parameters<typeof parseSharedOptions>[0]): string => {
  try {
    parseSharedOptions(raw);
  } catch (error) {
    expect(error).toBeInstanceOf(UsageError);
    return (error as Error).message;
  }
  throw new Error('expected a refusal');
};

describe('parseSharedOptions', () => {
  it('fills the documented defaults: classic, 60 s, the default robot timing, free heading, following not given', () => {
    const { options, notes } = parseSharedOptions(base);
    expect(options).toEqual({
      mapFile: MAP, scenFile: SCEN, agents: 3, model: 'classic', timeLimitSeconds: 60,
      timing: { forwardMs: DEFAULT_ROBOT_PROFILE.forwardMs, quarterTurnMs: DEFAULT_ROBOT_PROFILE.quarterTurnMs, waitMs: DEFAULT_ROBOT_PROFILE.waitMs },
      startHeading: 'free', k: undefined, following: undefined, suboptimality: 1, json: false,
    });
    expect(SHARED_DEFAULTS.timeLimitSeconds).toBe(60);
    expect(notes).toEqual([]);
  });

  it('takes --time-limit in seconds (fractions too) and the profile times in whole ms', () => {
    const { options } = parseSharedOptions({ ...base, 'time-limit': '2.5', 'turn-ms': '400', 'forward-ms': '900', 'wait-ms': '700' });
    expect(options.timeLimitSeconds).toBe(2.5);
    expect(options.timing).toEqual({ forwardMs: 900, quarterTurnMs: 400, waitMs: 700 });
  });

  it('accepts --k from 0 to MAX_K with k-robust only, and requires it there', () => {
    expect(parseSharedOptions({ ...base, model: 'k-robust', k: '0' }).options.k).toBe(0);
    expect(parseSharedOptions({ ...base, model: 'k-robust', k: String(MAX_K) }).options.k).toBe(MAX_K);
    expect(refusal({ ...base, model: 'k-robust', k: String(MAX_K + 1) })).toBe(`--k must be a whole number from 0 to ${MAX_K}, got '${MAX_K + 1}'`);
    expect(refusal({ ...base, model: 'k-robust', k: '1.5' })).toBe(`--k must be a whole number from 0 to ${MAX_K}, got '1.5'`);
    expect(refusal({ ...base, model: 'k-robust' })).toBe('--k is required with --model k-robust');
    expect(refusal({ ...base, k: '1' })).toBe('--k applies to the k-robust model only, not to classic');
  });

  it('takes --following for classic, uniform-duration and orientation-split and refuses it for the other two', () => {
    for (const model of ['classic', 'uniform-duration', 'orientation-split']) {
      expect(parseSharedOptions({ ...base, model, following: 'forbidden' }).options.following).toBe('forbidden');
      expect(parseSharedOptions({ ...base, model, following: 'allowed' }).options.following).toBe('allowed');
    }
    expect(refusal({ ...base, model: 'weighted-split', following: 'forbidden' }))
      .toBe('--following applies to classic, uniform-duration, orientation-split only, not weighted-split: weighted-split plans run on a continuous ms timeline, where no unit step defines following');
    expect(refusal({ ...base, model: 'k-robust', k: '1', following: 'allowed' }))
      .toBe('--following applies to classic, uniform-duration, orientation-split only, not k-robust: k-robust with k ≥ 1 already forbids following (and k = 0 is classic: use classic with following)');
    expect(refusal({ ...base, following: 'sometimes' })).toBe("--following must be allowed or forbidden, got 'sometimes'");
  });

  it('refuses --following for weighted-split and k-robust with the reason solveModel gives', () => {
    const instance = loadInstance(MAP, SCEN, 2);
    let compared = 0;
    for (const model of ['weighted-split', 'k-robust'] as const) {
      const k = model === 'k-robust' ? 1 : undefined;
      const options = { following: 'forbidden', k } as Parameters<typeof solveModel>[2];
      let solverMessage = '';
      try {
        solveModel(model, instance, options);
      } catch (error) {
        solverMessage = (error as Error).message;
      }
      expect(solverMessage).toMatch(/^option following applies to /);
      expect(refusal({ ...base, model, following: 'forbidden', ...(k !== undefined ? { k: String(k) } : {}) }))
        .toBe(solverMessage.replace(/^option following/, '--following'));
      compared++;
    }
    expect(compared).toBe(2);
  });

  it('takes --suboptimality from 1 to 10 for every model and passes it to solveModel only when above 1', () => {
    let compared = 0;
    for (const model of ['classic', 'uniform-duration', 'orientation-split', 'weighted-split', 'k-robust']) {
      const k = model === 'k-robust' ? { k: '1' } : {};
      const parsed = parseSharedOptions({ ...base, model, ...k, suboptimality: '1.25' }).options;
      expect(parsed.suboptimality).toBe(1.25);
      expect(modelSolveOptions(parsed, DEFAULT_ROBOT_PROFILE).suboptimality).toBe(1.25);
      const exact = parseSharedOptions({ ...base, model, ...k, suboptimality: '1' }).options;
      expect('suboptimality' in modelSolveOptions(exact, DEFAULT_ROBOT_PROFILE)).toBe(false);
      compared++;
    }
    expect(compared).toBe(5);
    for (const bad of ['0.9', '10.5', 'fast', '', 'Infinity']) {
      expect(refusal({ ...base, suboptimality: bad })).toBe(`--suboptimality must be a number from 1 to 10 (1 = optimal), got '${bad}'`);
    }
  });

  it('adds the weighted-split wait note only when --wait-ms is given with weighted-split', () => {
    expect(parseSharedOptions({ ...base, model: 'weighted-split', 'wait-ms': '500' }).notes).toEqual([WEIGHTED_SPLIT_WAIT_NOTE]);
    expect(parseSharedOptions({ ...base, model: 'weighted-split' }).notes).toEqual([]);
    expect(parseSharedOptions({ ...base, model: 'classic', 'wait-ms': '500' }).notes).toEqual([]);
  });
});

describe('solve and execute parse the shared options identically', () => {
  // Each case: the shared arguments and the message both CLIs must print (after their name).
  const cases: [string[], string][] = [
    [['--agents', '0'], "--agents must be a whole number ≥ 1, got '0'"],
    [['--time-limit', '0'], "--time-limit must be a positive number of seconds, got '0'"],
    [['--model', 'diagonal'], "--model must be one of classic, uniform-duration, orientation-split, weighted-split, k-robust, got 'diagonal'"],
    [['--turn-ms', '0'], "--turn-ms must be a whole number of ms ≥ 1, got '0'"],
    [['--forward-ms', '2.5'], "--forward-ms must be a whole number of ms ≥ 1, got '2.5'"],
    [['--wait-ms', 'x'], "--wait-ms must be a whole number of ms ≥ 1, got 'x'"],
    [['--model', 'k-robust', '--k', String(MAX_K + 1)], `--k must be a whole number from 0 to ${MAX_K}, got '${MAX_K + 1}'`],
    [['--model', 'k-robust'], '--k is required with --model k-robust'],
    [['--model', 'orientation-split', '--k', '2'], '--k applies to the k-robust model only, not to orientation-split'],
    [['--start-heading', 'NE'], "--start-heading must be N, E, S, W or free, got 'NE'"],
    [['--model', 'weighted-split', '--following', 'forbidden'], '--following applies to classic, uniform-duration, orientation-split only, not weighted-split: weighted-split plans run on a continuous ms timeline, where no unit step defines following'],
    [['--following', 'never'], "--following must be allowed or forbidden, got 'never'"],
    [['--suboptimality', '0.5'], "--suboptimality must be a number from 1 to 10 (1 = optimal), got '0.5'"],
  ];

  it('refuses the same bad shared options with the same message and exit code 2', () => {
    let compared = 0;
    for (const [args, message] of cases) {
      const files = ['--map', MAP, '--scen', SCEN, '--agents', '3'];
      const full = args[0] === '--agents' ? ['--map', MAP, '--scen', SCEN, ...args] : [...files, ...args];
      const solve = cli('solve', full);
      const execute = cli('execute', [...full, '--policy', 'lockstep']);
      expect([solve.status, solve.stderr.split('\n')[0]]).toEqual([2, `solve: ${message}`]);
      expect([execute.status, execute.stderr.split('\n')[0]]).toEqual([2, `execute: ${message}`]);
      compared++;
    }
    expect(compared).toBe(13);
  });

  it.each([
    ['orientation-split', ['--start-heading', 'E']],
    ['weighted-split', []],
  ])('reads the same %s plan from the same options: open-loop at zero noise realises the planned turn-inclusive makespan', (model, extra) => {
    const args = ['--map', MAP, '--scen', SCEN, '--agents', '5', '--model', model, ...extra,
      '--forward-ms', '900', '--turn-ms', '400', '--wait-ms', '700', '--time-limit', '20', '--json'];
    const solve = cli('solve', args);
    const execute = cli('execute', [...args, '--policy', 'open-loop', '--runs', '1']);
    expect([solve.status, execute.status]).toEqual([0, 0]);
    const planned = JSON.parse(solve.stdout);
    const realised = JSON.parse(execute.stdout);
    expect(planned.status).toBe('solved');
    expect(planned.profile).toMatchObject({ forwardMs: 900, quarterTurnMs: 400, waitMs: 700 });
    // The realised makespan of a nominal open-loop run is the plan's own, so both CLIs solved the same plan.
    expect(realised.collisions.total).toBe(0);
    expect(realised.realisedMakespanMs.mean).toBe(planned.turnInclusiveMakespanMs);
  });

  it('lists every shared option in both --help texts', () => {
    const solve = cli('solve', ['--help']);
    const execute = cli('execute', ['--help']);
    expect([solve.status, execute.status]).toEqual([0, 0]);
    expect(SHARED_HELP.length).toBeGreaterThan(10);
    for (const line of SHARED_HELP) {
      expect(solve.stdout).toContain(line);
      expect(execute.stdout).toContain(line);
    }
  });
});
