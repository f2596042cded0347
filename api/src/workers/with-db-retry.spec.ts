/** Which errors count as a lost connection (retried), and that withDbRetry retries only those. */
import { isConnectionError, withDbRetry } from './with-db-retry';

describe('isConnectionError', () => {
  // Messages and SQLSTATE codes as pg and PostgreSQL 15 report them (PostgreSQL docs, Appendix A: 57P01 admin_shutdown, 57P03 cannot_connect_now).
  it.each([
    ['fast shutdown', Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' })],
    ['restart in progress', Object.assign(new Error('the database system is starting up'), { code: '57P03' })],
    ['refused', Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:54329'), { code: 'ECONNREFUSED' })],
    ['reused broken client', new Error('Client has encountered a connection error and is not queryable')],
    ['Sequelize wrapper', Object.assign(new Error('connect ECONNREFUSED'), { name: 'SequelizeConnectionRefusedError' })],
    ['wrapped cause', Object.assign(new Error('query failed'), { parent: { code: '57P01', message: 'terminating connection' } })],
  ])('%s is a connection error', (_what, err) => {
    expect(isConnectionError(err)).toBe(true);
  });

  it.each([
    ['bad column', Object.assign(new Error('column "sooc" does not exist'), { code: '42703' })],
    ['unique key', Object.assign(new Error('duplicate key value violates unique constraint "results_run_id_key"'), { code: '23505' })],
    ['not an error', undefined],
  ])('%s is not', (_what, err) => {
    expect(isConnectionError(err)).toBe(false);
  });
});

describe('withDbRetry', () => {
  it('retries a lost connection until the step succeeds', async () => {
    let calls = 0;
    const value = await withDbRetry(async () => {
      calls++;
      if (calls < 3) throw Object.assign(new Error('connect ECONNREFUSED'), { code: 'ECONNREFUSED' });
      return 'written';
    }, 10_000);
    expect([value, calls]).toEqual(['written', 3]);
  });

  it('passes any other error through at once', async () => {
    let calls = 0;
    await expect(withDbRetry(async () => {
      calls++;
      throw new Error('column "sooc" does not exist');
    })).rejects.toThrow('sooc');
    expect(calls).toBe(1);
  });
});
