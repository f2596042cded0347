/** Human words for sweep and run statuses, shared by the list and the detail page. */
import type { RunStatus, SweepStatus } from '@shared/runs';

/** Label of a sweep status. */
export const SWEEP_STATUS_LABEL: Readonly<Record<SweepStatus, string>> = {
  queued: 'Waiting for a worker', running: 'Running', finished: 'Finished', failed: 'Ended with errors', cancelled: 'Cancelled',
};

/** Label of a run status. */
export const RUN_STATUS_LABEL: Readonly<Record<RunStatus, string>> = {
  pending: 'waiting', running: 'running', solved: 'solved', infeasible: 'infeasible', timeout: 'time limit', memory: 'memory limit', error: 'error', cancelled: 'cancelled',
};

/** A duration in ms as "1 h 4 min", "3 min 20 s" or "12 s". */
export function formatDuration(ms: number): string {
  const s = Math.round(ms / 1000);
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${s % 60} s`;
  return `${Math.floor(m / 60)} h ${m % 60} min`;
}
