/** GNU time's report as the external process runner reads it (the runner itself is exercised with real processes in test/integration/external-solvers.spec.ts). */
import { lastLine, parseTimeReport } from './external-process';

describe('parseTimeReport', () => {
  it('reads CPU time and peak memory of a clean exit', () => {
    expect(parseTimeReport('qt-usage 0.42 0.08 51200\n')).toEqual({ cpuTimeMs: 500, peakMemoryKb: 51200, exitCode: 0, signalNumber: null });
  });

  it('reads a nonzero status and a signal (GNU time writes a line before its format)', () => {
    expect(parseTimeReport('Command exited with non-zero status 3\nqt-usage 0.10 0.02 40000\n')).toEqual({ cpuTimeMs: 120, peakMemoryKb: 40000, exitCode: 3, signalNumber: null });
    expect(parseTimeReport('Command terminated by signal 9\nqt-usage 1.00 0.50 90000\n')).toEqual({ cpuTimeMs: 1500, peakMemoryKb: 90000, exitCode: null, signalNumber: 9 });
  });

  it('knows nothing when GNU time wrote nothing', () => {
    expect(parseTimeReport('')).toEqual({ cpuTimeMs: null, peakMemoryKb: null, exitCode: null, signalNumber: null });
  });

  it('takes the last non-empty line of output, shortened', () => {
    expect(lastLine('a\nb\n\n')).toBe('b');
    expect(lastLine('x'.repeat(400), 10)).toBe(`${'x'.repeat(10)}…`);
  });
});
