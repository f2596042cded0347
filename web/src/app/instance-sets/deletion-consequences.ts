/**
 * The sentences of the deletion dialog: what deleting a set, map or scenario takes with it, read from
 * GET /api/…/deletion-preview (the database cascades; migrations 0100, 0200, 0400). Pure, so the
 * wording is tested without a dialog.
 */
import type { DeletionPreview } from '@shared/instance-sets';

const count = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** One line per thing that goes too; empty when nothing else goes. */
export function deletionConsequences(p: DeletionPreview): string[] {
  const lines: string[] = [];
  if (p.maps > 0) lines.push(`its ${count(p.maps, 'map', 'maps')}`);
  if (p.kind !== 'scenario' && p.scenarios > 0) lines.push(`its ${count(p.scenarios, 'scenario', 'scenarios')}`);
  if (p.results > 0) {
    const submitted = p.submissions > 0 ? ` (${p.submissions} of them submitted plan${p.submissions === 1 ? '' : 's'})` : '';
    lines.push(`${count(p.results, 'stored result', 'stored results')}${submitted}, with their execution replays and leaderboard entries`);
  }
  if (p.runs > 0) {
    lines.push(`${count(p.runs, 'run', 'runs')} of ${count(p.sweeps, 'sweep', 'sweeps')}; the ${p.sweeps === 1 ? 'sweep stays' : 'sweeps stay'} with fewer runs`);
  }
  return lines;
}
