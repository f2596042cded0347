/** How a batch's progress and refusals read. */
import type { SubmissionBatchSummary } from '@shared/submission-batches';
import { batchProgress, readJsonBatchFile, refusalText } from './batch-outcomes';

const summary: SubmissionBatchSummary = {
  id: 1, status: 'running', source: 'json', fileName: null, total: 3, done: 1, accepted: 0, refused: 1, createdAt: '2026-05-01T08:00:00.000Z', finishedAt: null,
};

describe('batch outcomes', () => {
  it('rounds progress to whole percent and says what is left', () => {
    expect(batchProgress(summary)).toEqual({ percent: 33, caption: '1 of 3 plans checking… · 0 accepted · 1 refused' });
    expect(batchProgress({ ...summary, status: 'done', done: 3, accepted: 2 }).caption).toBe('3 of 3 plans all checked · 2 accepted · 1 refused');
  });

  it('names the file, line, column and field of a reading problem, and only the field when the problem has no place', () => {
    const placed = refusalText({ code: 'VALIDATION_FAILED', message: 'x', problems: [{ file: 'plans/b.txt', line: 2, column: 7, field: 'agent 1, cell 1', message: 'expected a cell' }] });
    const unplaced = refusalText({ code: 'VALIDATION_FAILED', message: 'x', problems: [{ file: 'plans[0]', line: 0, column: 0, field: 'paths', message: 'Required' }] });

    expect(placed).toBe('plans/b.txt, line 2, column 7 (agent 1, cell 1): expected a cell');
    expect(unplaced).toBe('plans[0] (paths): Required');
  });

  it('falls back to the message when a refusal has neither a violation nor problems', () => {
    expect(refusalText({ code: 'SCENARIO_NOT_FOUND', message: "No scenario 'a.scen' in set 'Depot'" })).toBe("No scenario 'a.scen' in set 'Depot'");
  });

  it('refuses a JSON batch file that does not parse, before anything is sent', () => {
    expect(readJsonBatchFile('{"plans": [')).toMatchObject({ ok: false });
    expect(readJsonBatchFile('[]')).toEqual({ ok: true, manifest: [] });
  });
});
