/**
 * The columns a LaTeX table of the entries layout gets when the viewer kept the board's default
 * columns: the 21 default columns fit \textwidth only scaled to about 0.29 of \small, which no
 * reader can read in print. A paper needs the instance, the model, its status (why a row has no cost), its costs, the solve time and
 * the headline execution figure; any other choice on the board is exported as chosen.
 */
import { DEFAULT_ENTRY_COLUMNS, type LeaderboardView } from '@shared/leaderboards';
import type { ExportFormat } from '@shared/exports-table';

/** Entries-layout columns of a LaTeX export made from the default board columns (12; in a 345 pt article set at ≈ 0.6 × \small with mixed profiles, test/integration/export.spec.ts). */
export const PAPER_ENTRY_COLUMNS: readonly string[] = [
  'map', 'scenario', 'agents', 'model', 'variant', 'status', 'socSteps', 'socMs', 'tiMakespanMs', 'optimality', 'runtimeMs', 'successOpenLoop',
];

const sameColumns = (a: readonly string[], b: readonly string[]): boolean => a.length === b.length && a.every((id, i) => id === b[i]);

/**
 * `view` with the paper columns when `format` is LaTeX and the entries view has the default
 * columns, unless `keepShown` (query `latexColumns=shown`: every column on screen); else `view` unchanged.
 */
export function withPaperColumns(view: LeaderboardView, format: ExportFormat, keepShown = false): LeaderboardView {
  if (keepShown || format !== 'latex' || view.layout !== 'entries' || !sameColumns(view.columns, DEFAULT_ENTRY_COLUMNS)) return view;
  return { ...view, columns: PAPER_ENTRY_COLUMNS };
}
