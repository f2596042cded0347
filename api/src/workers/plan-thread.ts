/**
 * The piscina task function of every pool thread: says "started" on the envelope's port (the
 * pool's hard limit counts from here), then runs the job by kind. Jobs are timed with
 * performance.now; an AppError a job raises on purpose (a bad generator parameter) comes back as
 * a refusal, since class instances do not survive the thread boundary.
 */
import { runPlanTask } from '@solvers/run/run-plan-task';
import { AppError } from '../errors/app-error';
import { executeTask } from '../executions/execute-task';
import { generateEntries } from '../instance-sets/generate-entries';
import { checkPlan } from '../submissions/check-plan';
import type { ThreadAnswer, ThreadEnvelope } from './thread-job';

/** Runs the envelope's job (the pool terminates the thread on the hard time limit or a cancel). */
export default function planThread(envelope: ThreadEnvelope): ThreadAnswer {
  envelope.started?.postMessage('started');
  envelope.started?.close();
  const { job } = envelope;
  try {
    switch (job.kind) {
      case 'plan': return { ok: true, value: runPlanTask(job.task, { now: () => performance.now() }) };
      case 'execute': return { ok: true, value: executeTask(job.task) };
      case 'generate': return { ok: true, value: generateEntries(job.request).map((e) => ({ name: e.name, bytes: e.bytes })) };
      case 'check-plan': return { ok: true, value: checkPlan(job.instance, job.submission) };
      case 'ping': return { ok: true, value: 'pong' };
    }
  } catch (err) {
    if (err instanceof AppError) return { ok: false, refusal: { status: err.status, code: err.code, message: err.message, details: err.details } };
    throw err;
  }
}
