/**
 * Re-runs an execution in the browser with solvers/execute (pure, so the same code and seed give
 * the server's numbers): the Monte Carlo batch in chunks that yield to the page between them, and
 * the track of the run to show. The summary follows simulateExecution exactly (same runs, same
 * run seeds, same statistics), checked against it in fleet-rerun.spec.ts.
 */
import { summaryView, type ExecutionInstanceView, type ExecutionSummaryView } from '@shared/executions';
import type { CollisionModeName, ExecutionPolicyName } from '@shared/executions-constants';
import type { RobotProfile, Schedule } from '@shared/plan';
import { ExecutionRunner, summariseRuns, type NoiseModel, type RunMetrics } from '@solvers/execute';
import type { MapfInstance } from '@solvers/instance';
import { trackFromRunner, type FleetTrack } from './fleet-track';

/** The settings of a re-run. */
export interface RerunSettings {
  readonly policy: ExecutionPolicyName;
  readonly noise: Partial<NoiseModel>;
  readonly seed: number;
  readonly runs: number;
  readonly onCollision: CollisionModeName;
  /** Which run (0-based) to return the track of. */
  readonly shownRun: number;
}

/** A re-run's summary and the track of the shown run. */
export interface RerunResult {
  readonly summary: ExecutionSummaryView;
  readonly track: FleetTrack;
}

/** Options of rerunInBrowser. */
export interface RerunOptions {
  /** Work per chunk before yielding to the page, ms of wall time (default 12, under one frame). */
  readonly chunkMs?: number;
  readonly signal?: AbortSignal;
  /** Clock for chunking (default performance.now). */
  readonly now?: () => number;
  /** How to yield (default a zero timeout). */
  readonly yieldToPage?: () => Promise<void>;
}

/** The solver instance of an execution's instance view ('.' = free). */
export function toMapfInstance(view: ExecutionInstanceView): MapfInstance {
  const { width, height } = view;
  const passable = new Uint8Array(width * height);
  view.rows.forEach((row, y) => {
    for (let x = 0; x < width; x++) passable[y * width + x] = row[x] === '.' ? 1 : 0;
  });
  return {
    grid: { width, height, passable },
    agents: view.agents.map((a) => ({
      start: a.start[1] * width + a.start[0],
      goal: a.goal[1] * width + a.goal[0],
      ...(a.startHeading ? { startHeading: a.startHeading } : {}),
    })),
  };
}

/** Simulates the batch and the shown run; throws what the simulator throws on a bad plan or setting. */
export async function rerunInBrowser(
  instance: MapfInstance,
  plan: { readonly timeline: 'steps' | 'ms'; readonly schedule: Schedule },
  profile: RobotProfile,
  settings: RerunSettings,
  options: RerunOptions = {},
): Promise<RerunResult> {
  const now = options.now ?? (() => performance.now());
  const yieldToPage = options.yieldToPage ?? (() => new Promise<void>((resolve) => setTimeout(resolve, 0)));
  const chunkMs = options.chunkMs ?? 12;
  const runner = new ExecutionRunner(instance, plan, profile, {
    policy: settings.policy, noise: settings.noise, seed: settings.seed, onCollision: settings.onCollision,
  });
  const perRun: RunMetrics[] = [];
  let isAborted = false;
  let chunkStart = now();
  for (let r = 0; r < settings.runs; r++) {
    if (options.signal?.aborted) {
      isAborted = true;
      break;
    }
    perRun.push(runner.run(r));
    if (now() - chunkStart > chunkMs && r + 1 < settings.runs) {
      await yieldToPage();
      chunkStart = now();
    }
  }
  // The runner's buffers hold the last run; simulate the shown one again for its track.
  runner.run(Math.min(Math.max(0, settings.shownRun), Math.max(0, settings.runs - 1)));
  return { summary: summarise(runner, settings, perRun, isAborted), track: trackFromRunner(runner) };
}

/** The track of one run (no batch): what the viewer shows next to a summary computed elsewhere. */
export function trackOfRun(
  instance: MapfInstance,
  plan: { readonly timeline: 'steps' | 'ms'; readonly schedule: Schedule },
  profile: RobotProfile,
  settings: RerunSettings,
): FleetTrack {
  const runner = new ExecutionRunner(instance, plan, profile, {
    policy: settings.policy, noise: settings.noise, seed: settings.seed, onCollision: settings.onCollision,
  });
  runner.run(Math.max(0, settings.shownRun));
  return trackFromRunner(runner);
}

/** The summary of a batch: simulateExecution's own summary of the same runs, in JSON form. */
function summarise(runner: ExecutionRunner, settings: RerunSettings, perRun: readonly RunMetrics[], isAborted: boolean): ExecutionSummaryView {
  return summaryView(summariseRuns(runner, settings, perRun, isAborted));
}
