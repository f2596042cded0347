/** How the batch section shows a batch: its progress and one row per plan. Zod-free, no Angular. */
import type { BatchEntryRefusal, BatchEntryView, SubmissionBatchSummary } from '@shared/submission-batches';

/** A batch's progress as the bar and its caption show it. */
export interface BatchProgress {
  /** 0–100. */
  readonly percent: number;
  readonly caption: string;
}

/** Progress of `b`: plans checked of all, and how many were accepted and refused so far. */
export function batchProgress(b: SubmissionBatchSummary): BatchProgress {
  const percent = b.total === 0 ? 100 : Math.round((100 * b.done) / b.total);
  const state = b.status === 'done' ? 'all checked' : 'checking…';
  return { percent, caption: `${b.done} of ${b.total} plans ${state} · ${b.accepted} accepted · ${b.refused} refused` };
}

/** One plan's row of the outcome table. */
export interface OutcomeRow {
  readonly position: number;
  /** The plan file and, for a zip, the manifest line naming it. */
  readonly source: string;
  readonly instance: string;
  readonly status: BatchEntryView['status'];
  /** "SOC 4 · makespan 2 · turn-inclusive makespan 2,000 ms" for an accepted plan. */
  readonly figures: string | null;
  /** Success rate per policy of an accepted plan, in the order the server sends them. */
  readonly rates: readonly { readonly policy: string; readonly rate: number }[];
  /** Why a refused plan was refused. */
  readonly reason: string | null;
  /** The stored result of an accepted plan (the plan viewer opens it). */
  readonly resultId: number | null;
}

const whole = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });

/** The refusal as one sentence: the violation with agents, time and cell, the first reading problem with its place, or the message. */
export function refusalText(r: BatchEntryRefusal): string {
  if (r.violation) {
    const v = r.violation;
    return `${v.kind}: agents ${v.agents.join(', ')} at time ${v.time}, cell (${v.cell[0]}, ${v.cell[1]}): ${v.message}`;
  }
  const p = r.problems?.[0];
  if (p) {
    const place = [p.file, p.line > 0 ? `line ${p.line}, column ${p.column}` : ''].filter(Boolean).join(', ');
    return `${place ? `${place} ` : ''}(${p.field}): ${p.message}`;
  }
  return r.message;
}

/** The table rows of a batch's plans. */
export function outcomeRows(entries: readonly BatchEntryView[]): OutcomeRow[] {
  return entries.map((e) => {
    const a = e.accepted;
    return {
      position: e.position,
      source: e.line > 0 ? `${e.file} (batch.json line ${e.line})` : e.file,
      instance: a ? `${a.mapName} / ${a.scenarioName} · ${a.agents} agent${a.agents === 1 ? '' : 's'}` : e.instance,
      status: e.status,
      figures: a ? `${a.model}${a.variant ? ` (${a.variant})` : ''} · SOC ${a.soc} · makespan ${a.makespan} · turn-inclusive makespan ${whole.format(a.turnInclusiveMakespanMs)} ms` : null,
      rates: a ? a.executions.map((x) => ({ policy: x.policy, rate: x.successRate })) : [],
      reason: e.refusal ? refusalText(e.refusal) : null,
      resultId: a?.resultId ?? null,
    };
  });
}

/** A JSON batch file read in the browser: the manifest to send, or why it cannot be sent. */
export function readJsonBatchFile(text: string): { ok: true; manifest: unknown } | { ok: false; message: string } {
  try {
    return { ok: true, manifest: JSON.parse(text) };
  } catch (err) {
    return { ok: false, message: `The file is not valid JSON (${err instanceof Error ? err.message : String(err)}).` };
  }
}
