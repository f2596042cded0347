/**
 * The piscina task function of every pool thread: says "started" on the envelope's port (the
 * pool's hard limit counts from here), then runs the job by kind. Jobs are timed with
 * performance.now; an AppError a job raises on purpose (a bad generator parameter) comes back as
 * a refusal, since class instances do not survive the thread boundary. An upload's checks answer
 * with their byte arrays transferred, not copied (Piscina.move), so the event loop never copies them.
 */
import type { MessagePort } from 'node:worker_threads';
import { Piscina } from 'piscina';
import { runPlanTask } from '@solvers/run/run-plan-task';
import { AppError } from '../errors/app-error';
import { executeTask } from '../executions/execute-task';
import { generateEntries } from '../instance-sets/generate-entries';
import {
  preparedBytes, prepareUpload, transferListOf, type ExistingMapRows, type PrepareUploadJob,
} from '../instance-sets/prepare-upload';
import { checkPlan } from '../submissions/check-plan';
import { checkTrials } from '../trials/check-trials';
import { fitTrialLogs } from '../trials/calibrate-trials';
import type { MapRequest, ThreadAnswer, ThreadEnvelope } from './thread-job';

/** Runs the envelope's job (the pool terminates the thread on the hard time limit or a cancel). */
export default function planThread(envelope: ThreadEnvelope): ThreadAnswer | Promise<ThreadAnswer> {
  envelope.started?.postMessage('started');
  envelope.started?.close();
  const { job } = envelope;
  try {
    switch (job.kind) {
      case 'plan': return { ok: true, value: runPlanTask(job.task, { now: () => performance.now() }) };
      case 'execute': return { ok: true, value: executeTask(job.task) };
      case 'generate': return { ok: true, value: generateEntries(job.request).map((e) => ({ name: e.name, bytes: e.bytes })) };
      case 'check-plan': return { ok: true, value: checkPlan(job.instance, job.submission, job.replay) };
      case 'prepare-upload': return prepareInThread(job.upload, job.maps);
      case 'check-trials': return checkTrials(job.job).then((value) => ({ ok: true, value }));
      case 'calibrate-trials': return { ok: true, value: fitTrialLogs(job.logs) };
      case 'ping': return { ok: true, value: 'pong' };
    }
  } catch (err) {
    if (err instanceof AppError) return { ok: false, refusal: { status: err.status, code: err.code, message: err.message, details: err.details } };
    throw err;
  }
}

/** Checks an upload, asking the request's side for stored maps on `port`; the answer's bytes are moved back. */
async function prepareInThread(upload: PrepareUploadJob, port: MessagePort): Promise<ThreadAnswer> {
  try {
    const prepared = await prepareUpload(upload, (names) => askForMaps(port, names));
    const answer: ThreadAnswer = { ok: true, value: prepared };
    // A movable wrapper: piscina posts [valueSymbol] with [transferableSymbol] as the transfer list.
    // (piscina's Transferable type names its own unique symbols, which these are at run time.)
    const wrapper = { [Piscina.transferableSymbol]: transferListOf(preparedBytes(prepared)), [Piscina.valueSymbol]: answer };
    const movable = Piscina.move(wrapper as unknown as Parameters<typeof Piscina.move>[0]);
    return movable as unknown as ThreadAnswer;
  } finally {
    port.close();
  }
}

function askForMaps(port: MessagePort, names: readonly string[]): Promise<readonly ExistingMapRows[]> {
  return new Promise((resolve, reject) => {
    port.once('message', (answer: readonly ExistingMapRows[] | { error: string }) => {
      if ('error' in answer) reject(new Error(`reading the set's maps failed: ${answer.error}`));
      else resolve(answer);
    });
    const request: MapRequest = { names };
    port.postMessage(request);
  });
}
