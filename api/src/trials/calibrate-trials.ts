/**
 * Fitting a robot profile to stored trial logs (issue 17, item 4), run in a thread of the
 * interactive pool: the logs are parsed again (they were valid when stored) and handed to the
 * trial library's maximum-likelihood fit (solvers/trials/calibrate.ts).
 */
import { parseTrialLog, type TrialLog } from '@shared/trial-log';
import { calibrateProfile, type CalibrationResult } from '@solvers/trials/calibrate';

/** One stored log as text. */
export interface StoredLogText {
  readonly name: string;
  readonly text: string;
}

/** Parses the logs and fits the profile (a log that no longer parses is reported like any invalid input). */
export function fitTrialLogs(logs: readonly StoredLogText[]): CalibrationResult {
  const parsed: TrialLog[] = [];
  for (const l of logs) {
    const p = parseTrialLog(l.name, l.text);
    if (p.kind === 'invalid') return { kind: 'invalid', errors: p.errors };
    parsed.push(p.log);
  }
  return calibrateProfile(parsed);
}
