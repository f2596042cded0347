/** Queue names and job expiry of sweep runs (api/src/workers/sweep-queue.ts). */
import { EXTERNAL_CHECK_LIMIT_MS, externalJobLimitMs, externalRunQueue, runJobExpirySeconds } from './sweep-queue';

describe('externalRunQueue', () => {
  it('names the queue with letters, digits, _ and - only, the name and version readable in it', () => {
    const refs = [
      { name: 'prioritised-astar', version: '1.0.0' }, { name: 'lacam', version: '3+fix' }, { name: 'x', version: 'A.b-c+d' },
    ];
    for (const ref of refs) expect(externalRunQueue(ref)).toMatch(/^[A-Za-z0-9_-]+$/);
    expect(externalRunQueue(refs[0])).toMatch(/^qt-external-runs-prioritised-astar-1_0_0-[0-9a-f]{8}$/);
    expect(externalRunQueue(refs[1])).toMatch(/^qt-external-runs-lacam-3_fix-[0-9a-f]{8}$/);
  });

  it('keeps keys apart that read alike once written this way', () => {
    const pairs = [
      [{ name: 'lacam', version: '1.0' }, { name: 'lacam', version: '1+0' }],
      [{ name: 'a-1', version: '2' }, { name: 'a', version: '1-2' }],
    ];
    for (const [a, b] of pairs) expect(externalRunQueue(a)).not.toBe(externalRunQueue(b));
    expect(externalRunQueue({ name: 'lacam', version: '1.0' })).toBe(externalRunQueue({ name: 'lacam', version: '1.0' }));
  });
});

describe('job expiry of an external run', () => {
  it('covers the process limit, then the check limit, then the margin', () => {
    expect(EXTERNAL_CHECK_LIMIT_MS).toBe(60_000);
    expect(externalJobLimitMs(10_000)).toBe(70_000);
    expect(runJobExpirySeconds(externalJobLimitMs(10_000), 3)).toBe(73);
  });
});
