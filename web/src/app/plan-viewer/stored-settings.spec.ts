import type { ExecutionSummaryView } from '@shared/executions';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import { settingsDifferences, storedFigureMismatches, storedReplayFor } from './stored-settings';

const base = { noise: { jitterCv: 0.15, stallProbability: 0.05, stallMs: 1500 }, runs: 25, seed: 7, onCollision: 'count' as const };
const metric = (mean: number, p95: number) => ({ mean, p95 });
const figures = {
  successRate: 0.92, collisions: { mean: 0.08, p95: 1, total: 2 },
  realisedMakespanMs: metric(47_700, 52_100), realisedSocMs: metric(300_000, 320_000), finishSpreadMs: metric(9800, 12_000), waitingMs: metric(0, 0),
};
const stored: StoredResultExecutionsView = {
  resultId: 41, sweepId: 3, model: 'classic',
  profile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0.15 },
  executions: [
    { settings: { policy: 'open-loop', ...base }, figures, recorded: { seed: true, onCollision: true }, error: null },
    { settings: { policy: 'lockstep', ...base }, figures, recorded: { seed: true, onCollision: true }, error: 'refused' },
    { settings: { policy: 'dependency-gated', ...base }, figures, recorded: { seed: true, onCollision: true }, error: null },
  ],
};

describe('stored settings', () => {
  it('opens the wanted stored policy, else open-loop; a refused replay is never opened', () => {
    expect(storedReplayFor(stored, 'dependency-gated')?.settings.policy).toBe('dependency-gated');
    expect(storedReplayFor(stored, 'lockstep')?.settings.policy).toBe('open-loop');
    expect(storedReplayFor(stored)?.settings.policy).toBe('open-loop');
    expect(storedReplayFor({ ...stored, executions: [] })).toBeNull();
  });

  it('names every setting that differs from the stored one, and nothing for the stored settings', () => {
    expect(settingsDifferences(stored, { policy: 'dependency-gated', ...base })).toEqual([]);
    expect(settingsDifferences(stored, { policy: 'open-loop', ...base, noise: { jitterCv: 0, stallProbability: 0, stallMs: 0 }, runs: 20, seed: 1, onCollision: 'stop' })).toEqual([
      'jitter CV 0 instead of 0.15', 'stall probability 0% instead of 5.0%', 'stall duration 0 s instead of 1.5 s',
      '20 runs instead of 25', 'seed 1 instead of 7', 'on collision "stop" instead of "count"',
    ]);
    expect(settingsDifferences(stored, { policy: 'lockstep', ...base })).toEqual(['policy lockstep (the sweep stored open-loop, dependency-gated)']);
  });

  it('compares the stored figures to the digit and names the ones that differ', () => {
    const same = { ...figures, policy: 'open-loop' } as unknown as ExecutionSummaryView;
    expect(storedFigureMismatches(stored.executions[0], same)).toEqual({ compared: 7, mismatches: [], lastBits: 0 });
    const off = { ...same, realisedMakespanMs: metric(44_200, 52_100), finishSpreadMs: metric(7200, 12_000) } as unknown as ExecutionSummaryView;
    expect(storedFigureMismatches(stored.executions[0], off).mismatches).toEqual([
      'realised makespan (mean): stored 47.7 s, replayed 44.2 s', 'finish spread (mean): stored 9.8 s, replayed 7.2 s',
    ]);
    // A browser replay's last-bit difference is equal within the tolerance, and counted; a real difference is not hidden.
    const spread = (figures as unknown as { finishSpreadMs: { mean: number; p95: number } }).finishSpreadMs;
    const lastBit = { ...same, finishSpreadMs: { ...spread, mean: spread.mean * (1 + 1e-13) } } as unknown as ExecutionSummaryView;
    expect(spread.mean * (1 + 1e-13)).not.toBe(spread.mean);
    expect(storedFigureMismatches(stored.executions[0], lastBit, 1e-9)).toEqual({ compared: 7, mismatches: [], lastBits: 1 });
    // Without a tolerance (server replays) it is a difference.
    expect(storedFigureMismatches(stored.executions[0], lastBit)).toMatchObject({ mismatches: ['finish spread (mean): stored 9.8 s, replayed 9.8 s'], lastBits: 0 });
    expect(storedFigureMismatches(stored.executions[0], off, 1e-9).mismatches).toHaveLength(2);
  });
});
