/** Texts of the history table's cells: where a result came from, its model parameters, its execution figures per policy. */
import type { HistoryItem, HistorySource } from '@shared/history';

/** Parameters that have columns of their own (plan model, w). */
const HIDDEN_PARAMETERS = new Set(['model', 'suboptimality']);

/**
 * The model parameters of a result in one line, e.g. `k=1, start heading N, switches off: bypass`;
 * the model itself and w have their own columns. `–` when there are none.
 */
export function parametersText(parameters: Readonly<Record<string, unknown>>): string {
  const parts: string[] = [];
  for (const [key, value] of Object.entries(parameters)) {
    if (HIDDEN_PARAMETERS.has(key) || value === undefined || value === null) continue;
    if (key === 'startHeading') parts.push(`start heading ${String(value)}`);
    else if (key === 'switches' && typeof value === 'object') {
      const off = Object.entries(value as Record<string, unknown>).filter(([, on]) => on === false).map(([name]) => name);
      if (off.length > 0) parts.push(`switches off: ${off.join(', ')}`);
    } else parts.push(`${key}=${typeof value === 'object' ? JSON.stringify(value) : String(value)}`);
  }
  return parts.length > 0 ? parts.join(', ') : '–';
}

/** Where a result came from, for people: `sweep 12 "depot check", run 40` (the name only for who may open the sweep) or `submission 3 by wren`. */
export function sourceText(source: HistorySource): string {
  if (source.kind === 'sweep') {
    const name = source.sweepName === null ? '' : ` "${source.sweepName}"`;
    return `sweep ${source.sweepId}${name}${source.runId !== null ? `, run ${source.runId}` : ''}`;
  }
  if (source.kind === 'submission') return `submission ${source.submissionId} by ${source.uploader}`;
  return 'stored without a sweep or submission';
}

/** The policies any item of the page was replayed under, in the order they first appear. */
export function policiesOf(items: readonly HistoryItem[]): string[] {
  return [...new Set(items.flatMap((i) => i.executions.map((e) => e.policy)))];
}

/** An item's figure under one policy, or null when it was not replayed under it. */
export function executionFigure(item: HistoryItem, policy: string, figure: 'successRate' | 'realisedMakespanMeanMs' | 'finishSpreadMeanMs'): number | null {
  return item.executions.find((e) => e.policy === policy)?.[figure] ?? null;
}

/** Runs behind an item's success rate under one policy (0 when not replayed). */
export function executionRuns(item: HistoryItem, policy: string): number {
  return item.executions.find((e) => e.policy === policy)?.runs ?? 0;
}

/** The executable-at-nominal flag as the board writes it. */
export function nominalText(flag: boolean | null): string {
  return flag === null ? 'not checked' : flag ? 'yes' : 'no';
}
