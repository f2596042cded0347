/** Reading the error answers of POST /api/submissions. */
import { problemOf } from './submission-rules';

describe('problemOf', () => {
  it('reads the first violation of a rejected plan', () => {
    const violation = { kind: 'vertex', agents: [0, 1], time: 2, cell: [2, 0] as const, message: 'agents 0 and 1 both at (2, 0) at t = 2' };
    expect(problemOf({ error: { code: 'PLAN_REJECTED', message: 'rejected', details: { violation } } })).toEqual({ kind: 'violation', message: 'rejected', violation });
  });

  it('reads file problems with line and column', () => {
    const problems = [{ file: 'p.txt', line: 2, column: 7, field: 'agent 1, cell 1', message: 'expected a cell' }];
    expect(problemOf({ error: { code: 'VALIDATION_FAILED', message: 'bad', details: problems } })).toEqual({ kind: 'file', message: 'bad', problems });
  });

  it('falls back to the message, or a sentence when there is no body', () => {
    expect(problemOf({ error: { code: 'SCENARIO_NOT_FOUND', message: 'No scenario 9' } })).toEqual({ kind: 'other', message: 'No scenario 9' });
    expect(problemOf(null).kind).toBe('other');
  });
});
