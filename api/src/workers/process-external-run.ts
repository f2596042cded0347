/**
 * One job of an external solver's queue (issue 16, item 4), start to end: claim the run, look up
 * the solver's registration, write the map and the scenario as stored (standard MAPF formats) into
 * a fresh temporary folder, run the registered command as a child process under the run's time
 * and memory limits (external-process.ts), read the plan it wrote with the submissions' reader,
 * check it with the model's validator and replay it under the sweep's execution settings (the
 * submissions' check, in a pool thread), and record the outcome exactly once like a built-in run.
 *
 * Every way it can go wrong is a recorded status with a reason, never a stuck run: the solver
 * removed or not solving the model (error), the program not starting (error), a crash (error),
 * the time limit (timeout), the memory limit (memory), no readable plan (error), an invalid plan
 * (error, the validator's first violation), a registration whose command this worker's operator
 * did not approve (error: its SHA-256 differs from the WORKER_SOLVERS pin), the run's folder or
 * files not writable here (error). Reasons begin with EXTERNAL_FAILURE_PREFIX.
 */
import { mkdtemp, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, join, resolve } from 'node:path';
import { EXTERNAL_FAILURE_PREFIX, isApprovedCommand, parseCommandTemplate, commandArguments, solverKey, type Placeholder, type SolverRef } from '@shared/external-solvers';
import { SubmissionRequestSchema } from '@shared/plan-format';
import type { ModelSpec, SweepDefinition } from '@shared/sweeps';
import type { PlanTask, PlanTaskResult } from '@solvers/run/plan-task';
import { bareResult } from '@solvers/run/run-plan-task';
import { taskLowerBound } from '@solvers/run/task-lower-bound';
import { toTaskInstance } from '@solvers/run/task-instance';
import { AppError } from '../errors/app-error';
import { commandSha256 } from '../external-solvers/command-hash';
import { findExternalSolver } from '../external-solvers/external-solvers.service';
import { loadInstance, type LoadedInstance } from '../instance-sets/load-instance';
import { readPlanFile, type ReadSubmission } from '../submissions/read-plan-file';
import { runExternalProcess, lastLine, type ExternalProcessOutcome } from './external-process';
import { claimRun, type JobOutcome, type RunContext } from './process-run';
import { recordRunResult, type ClaimedRun, type ExternalRunFacts } from './record-run-result';
import { EXTERNAL_CHECK_LIMIT_MS as CHECK_LIMIT_MS, type RunJobData } from './sweep-queue';
import { withDbRetry } from './with-db-retry';

/** The folder registered commands run in: the Quarterturn checkout of this worker (relative paths in a template start here). */
export const SOLVER_WORKING_DIRECTORY = resolve(__dirname, '..', '..', '..');

/** The largest plan file read, bytes (the submissions' limit on a plan's text). */
const MAX_PLAN_BYTES = 900_000;

/** Processes one job of an external solver's queue; throws only when the database stays unreachable. */
export async function processExternalRun(ctx: RunContext, job: RunJobData): Promise<JobOutcome> {
  const retry = <T>(fn: () => Promise<T>) => withDbRetry(fn, 60_000, ctx.isStopping);
  const claimed = await retry(() => claimRun(ctx.sequelize, job, ctx.workerName));
  if (!claimed) return { kind: 'skipped' };
  const { run, definition } = claimed;
  const spec = definition.models[run.modelIndex];
  const ref = spec.externalSolver;
  const started = performance.now();
  const record = async (result: PlanTaskResult, facts?: Partial<ExternalRunFacts>): Promise<JobOutcome> => {
    const external: ExternalRunFacts | undefined = ref
      ? { solverName: ref.name, solverVersion: ref.version, cpuTimeMs: facts?.cpuTimeMs ?? null, peakMemoryKb: facts?.peakMemoryKb ?? null }
      : undefined;
    const outcome = await retry(() => recordRunResult(ctx.sequelize, run, result, ctx.build, performance.now() - started, external));
    return { kind: 'recorded', record: outcome, result };
  };
  if (!ref) return record(bareResult('error', 'this run names no external solver but was queued for one'));

  const registration = await retry(() => findExternalSolver(ctx.sequelize, ref));
  if (!registration) return record(bareResult('error', `${EXTERNAL_FAILURE_PREFIX.unregistered}: ${solverKey(ref)} was removed after the sweep was launched`));
  if (!registration.models.includes(spec.model)) {
    return record(bareResult('error', `${EXTERNAL_FAILURE_PREFIX.unregistered}: ${solverKey(ref)} is registered for ${registration.models.join(', ')}, not ${spec.model}`));
  }
  // The worker's operator approved one command (WORKER_SOLVERS pins its SHA-256); a registration
  // changed since (removed and registered again with another command) never runs here.
  const registeredHash = commandSha256(registration.command);
  const approved = ctx.approvedCommand?.(ref);
  if (approved === undefined || !isApprovedCommand(approved, registeredHash)) {
    return record(bareResult('error', `${EXTERNAL_FAILURE_PREFIX.unapproved}: the worker's approved command differs from the registration `
      + `(registered command sha256:${registeredHash.slice(0, 16)}…, worker ${ctx.workerName} approved ${approved === undefined ? 'none' : `sha256:${approved.slice(0, 16)}…`}); `
      + "the worker's operator checks the registered command and pins its hash in WORKER_SOLVERS"));
  }
  const template = parseCommandTemplate(registration.command);
  if (!template.ok) return record(bareResult('error', `${EXTERNAL_FAILURE_PREFIX.spawn}: its command is refused: ${template.problems[0]}`));

  let loaded: LoadedInstance;
  let files: { map: Buffer; mapName: string; scenario: Buffer; scenarioName: string };
  try {
    loaded = await retry(() => loadInstance(ctx.models, run.scenarioId, run.agents));
    files = await retry(() => storedFiles(ctx, run));
  } catch (err) {
    return record(bareResult('error', `could not build the instance: ${(err as Error).message}`));
  }
  const task: PlanTask = {
    model: spec, instance: toTaskInstance(loaded.instance), profile: definition.robotProfile, timeLimitMs: definition.timeLimitMs,
    memoryLimitMb: definition.memoryLimitMb, seed: run.seed, execution: definition.execution,
  };

  // A local I/O failure (full or read-only temporary disk) is a recorded error, never a run left 'running'.
  let dir: string;
  try {
    dir = await mkdtemp(join(tmpdir(), `qt-run-${run.id}-`));
  } catch (err) {
    return record(bareResult('error', `${EXTERNAL_FAILURE_PREFIX.local}: no temporary folder: ${(err as Error).message}`));
  }
  try {
    const mapPath = join(dir, files.mapName);
    const scenarioPath = join(dir, files.scenarioName);
    const planPath = join(dir, registration.planFormat === 'json' ? 'plan.json' : 'plan.txt');
    try {
      await writeFile(mapPath, files.map);
      await writeFile(scenarioPath, files.scenario);
    } catch (err) {
      return record(bareResult('error', `${EXTERNAL_FAILURE_PREFIX.local}: could not write the instance files: ${(err as Error).message}`));
    }
    const values: Record<Placeholder, string> = {
      map: mapPath, scenario: scenarioPath, agents: String(run.agents), plan: planPath,
      timeLimitMs: String(definition.timeLimitMs), memoryLimitMb: String(definition.memoryLimitMb), seed: String(run.seed),
      model: spec.model, k: String('k' in spec ? spec.k : 0), startHeading: spec.startHeading, scenarioId: String(run.scenarioId),
      node: process.execPath,
    };
    const argv = commandArguments(template.words, values);
    const signal = ctx.signalFor(run.sweepId);
    const proc = await runExternalProcess({
      argv, cwd: SOLVER_WORKING_DIRECTORY, homeDir: dir, timeLimitMs: definition.timeLimitMs, memoryLimitMb: definition.memoryLimitMb, signal,
    });
    const facts = { cpuTimeMs: proc.cpuTimeMs, peakMemoryKb: proc.peakMemoryKb };
    const failed = failureOf(proc, definition, task);
    if (failed === 'aborted') {
      if (ctx.isStopping()) throw new Error(`run ${run.id} interrupted by worker shutdown`);
      return { kind: 'skipped' };
    }
    if (failed) return record(failed, facts);

    const read = await readPlan(planPath, registration.planFormat, spec, definition, run, ref);
    if ('reason' in read) return record(bareResult('error', `${EXTERNAL_FAILURE_PREFIX.badOutput}: ${read.reason}`, taskLowerBound(task), proc.wallMs), facts);
    const checked = await ctx.pool.runJob(
      { kind: 'check-plan', instance: loaded.instance, submission: read.submission, replay: { execution: definition.execution, seed: run.seed } },
      // The check's own limit, counted from its start (the job's expiry covers the process's limit plus this one).
      { hardLimitMs: CHECK_LIMIT_MS, memoryLimitMb: definition.memoryLimitMb, signal },
    );
    if (checked.kind === 'aborted') {
      if (ctx.isStopping()) throw new Error(`run ${run.id} interrupted by worker shutdown`);
      return { kind: 'skipped' };
    }
    if (checked.kind !== 'done') {
      const why = 'message' in checked ? checked.message : 'refusal' in checked ? checked.refusal.message : checked.kind;
      return record(bareResult('error', `the plan's check did not finish: ${why}`, taskLowerBound(task), proc.wallMs), facts);
    }
    const verdict = checked.result;
    if (!verdict.ok) {
      return record(bareResult('error', `${EXTERNAL_FAILURE_PREFIX.invalidPlan}: ${verdict.violation.message}`, taskLowerBound(task), proc.wallMs), facts);
    }
    return record({
      status: 'solved', soc: verdict.soc, makespan: verdict.makespan,
      turnInclusiveSocMs: verdict.turnInclusiveSocMs, turnInclusiveMakespanMs: verdict.turnInclusiveMakespanMs,
      // Our own root bound (each agent's shortest path alone); an external solver proves none we could trust.
      lowerBound: taskLowerBound(task),
      // Search nodes are not measured for an external program: stored as null (record-run-result.ts), shown as "–".
      runtimeMs: proc.wallMs, nodesGenerated: 0, nodesExpanded: 0, turns: verdict.turns, plan: verdict.storedPlan,
      executions: verdict.executions, atNominal: { isCollisionFree: verdict.atNominal.isCollisionFree, collisions: verdict.atNominal.collisions },
    }, facts);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

/** The recorded result of a process that did not exit cleanly, 'aborted', or null when it exited with 0. */
function failureOf(proc: ExternalProcessOutcome, definition: SweepDefinition, task: PlanTask): PlanTaskResult | 'aborted' | null {
  const tail = lastLine(proc.stderr) || lastLine(proc.stdout);
  const said = tail ? `; it said: ${tail}` : '';
  switch (proc.end) {
    case 'exited': return null;
    case 'aborted': return 'aborted';
    case 'timeout': return bareResult('timeout', `time limit reached: the external solver was ${proc.message}`, taskLowerBound(task), proc.wallMs);
    case 'memory': return bareResult('memory', `${proc.message}: the external solver died${said}`, taskLowerBound(task), proc.wallMs);
    case 'spawn-failed': return bareResult('error', `${EXTERNAL_FAILURE_PREFIX.spawn}: ${proc.message}${said}`);
    case 'crashed': return bareResult('error', `${EXTERNAL_FAILURE_PREFIX.crash}: ${proc.message} (limits: ${definition.timeLimitMs} ms, ${definition.memoryLimitMb} MB)${said}`, taskLowerBound(task), proc.wallMs);
  }
}

/** The stored bytes of the run's map and scenario, with file names safe to use in a folder of ours. */
async function storedFiles(ctx: RunContext, run: ClaimedRun): Promise<{ map: Buffer; mapName: string; scenario: Buffer; scenarioName: string }> {
  const scenario = await ctx.models.ScenarioFile.findByPk(run.scenarioId, { attributes: ['id', 'mapId', 'name', 'original'] });
  const map = scenario && (await ctx.models.MapFile.findByPk(scenario.mapId, { attributes: ['id', 'name', 'original'] }));
  if (!scenario || !map) throw new AppError('SCENARIO_NOT_FOUND', 404, `No scenario ${run.scenarioId}`);
  const safe = (name: string, fallback: string) => {
    const base = basename(name).replace(/[^A-Za-z0-9._-]/g, '_');
    return base === '' || base.startsWith('.') ? fallback : base;
  };
  const mapName = safe(map.name, 'instance.map');
  const scenarioName = safe(scenario.name, 'instance.scen');
  return { map: map.original, mapName, scenario: scenario.original, scenarioName: scenarioName === mapName ? `scenario-${scenarioName}` : scenarioName };
}

/** Reads the plan file the solver wrote; the submission, or why it cannot be read. */
async function readPlan(
  path: string, format: 'text' | 'json', spec: ModelSpec, definition: SweepDefinition, run: ClaimedRun, ref: SolverRef,
): Promise<{ readonly submission: ReadSubmission } | { readonly reason: string }> {
  const size = await stat(path).then((s) => s.size, () => -1);
  if (size < 0) return { reason: `it wrote no plan file (${basename(path)})` };
  if (size === 0) return { reason: 'the plan file is empty' };
  if (size > MAX_PLAN_BYTES) return { reason: `the plan file has ${size} bytes; at most ${MAX_PLAN_BYTES} are read` };
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    return { reason: `the plan file could not be read: ${(err as Error).message}` };
  }
  const request = format === 'json'
    ? { format, fileName: basename(path), text, robotProfile: definition.robotProfile }
    : {
      format, fileName: basename(path), text, model: spec.model, ...('k' in spec ? { k: spec.k } : {}), startHeading: spec.startHeading,
      instance: { scenarioId: run.scenarioId, agents: run.agents }, solver: ref, robotProfile: definition.robotProfile,
    };
  const parsed = SubmissionRequestSchema.safeParse(request);
  if (!parsed.success) return { reason: parsed.error.issues[0].message };
  let submission: ReadSubmission;
  try {
    submission = readPlanFile(parsed.data);
  } catch (err) {
    return { reason: (err as Error).message };
  }
  // A JSON document names what it is for; it must be this run's instance, model, k and start heading.
  const wanted = `${spec.model}${'k' in spec ? ` k=${spec.k}` : ''}, start heading ${spec.startHeading}, scenario ${run.scenarioId} with ${run.agents} agents`;
  const got = `${submission.model}${submission.k !== undefined ? ` k=${submission.k}` : ''}, start heading ${submission.startHeading}, scenario ${submission.scenarioId} with ${submission.agents} agents`;
  if (got !== wanted) return { reason: `the plan document is for ${got}, not for ${wanted}` };
  return { submission };
}
