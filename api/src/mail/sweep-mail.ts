/** The text of the e-mail a launcher receives when a sweep is over. */
import type { RunCounts, SweepStatus } from '@shared/runs';
import type { MailMessage } from './mailer';

/** What the message says. */
export interface SweepMailFacts {
  readonly to: string;
  readonly sweepId: number;
  readonly sweepName: string;
  readonly status: SweepStatus;
  readonly counts: Partial<RunCounts>;
  readonly total: number;
  /** Base URL of the app, for the link. */
  readonly publicUrl: string;
}

/** Builds the message (plain ASCII subject, so every mail client shows it as written). */
export function sweepMail(f: SweepMailFacts): MailMessage {
  const verb = f.status === 'failed' ? 'ended with errors' : f.status === 'cancelled' ? 'was cancelled' : 'finished';
  const c = (k: keyof RunCounts) => f.counts[k] ?? 0;
  const lines = [
    `Your sweep "${f.sweepName}" (#${f.sweepId}) ${verb}.`,
    '',
    `Runs: ${f.total}`,
    `  solved      ${c('solved')}`,
    `  infeasible  ${c('infeasible')}`,
    `  time limit  ${c('timeout')}`,
    `  memory      ${c('memory')}`,
    `  error       ${c('error')}`,
    `  cancelled   ${c('cancelled')}`,
    '',
    `Results: ${f.publicUrl}/sweeps/${f.sweepId}`,
    '',
    'Execution figures come from simulation, which is no safety assessment: before robots run near people,',
    'follow the applicable safety standards and local rules.',
    '',
    'You can turn these e-mails off in your account settings.',
  ];
  return { to: f.to, subject: `Quarterturn: sweep "${f.sweepName.replace(/[^\x20-\x7e]/g, '?')}" ${verb}`, text: lines.join('\n') };
}
