import { createStatsService } from './stats.service';

describe('createStatsService', () => {
  it('counts 0 for every figure nobody registered', async () => {
    expect(await createStatsService().read(null)).toEqual({ instanceSets: 0, maps: 0, scenarios: 0, sweeps: 0, results: 0 });
  });

  it('passes the viewer to counters and lets a later registration replace an earlier one', async () => {
    const stats = createStatsService();
    stats.register('sweeps', async () => 1);
    stats.register('sweeps', async (viewer) => (viewer ? 5 : 2));
    const viewer = { id: 1, login: 'a', displayName: 'A', email: null, role: 'researcher', isEmailOn: true, createdAt: '' } as const;
    expect((await stats.read(null)).sweeps).toBe(2);
    expect((await stats.read(viewer)).sweeps).toBe(5);
  });

  it('rejects when a counter fails, so the route answers 500 instead of a wrong 0', async () => {
    const stats = createStatsService();
    stats.register('results', async () => {
      throw new Error('down');
    });
    await expect(stats.read(null)).rejects.toThrow('down');
  });
});
