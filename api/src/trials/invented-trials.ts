/**
 * Invented trial logs: simulated runs of a plan written as trial logs (solvers/trials/simulated-trial.ts),
 * for the demo seed and tests. They are no field trials; whoever stores them says so in the notes.
 */
import type { ExecutionInstanceView } from '@shared/executions';
import type { RobotProfile } from '@shared/plan';
import { formatTrialLogCsv } from '@shared/trial-log';
import { realisedTimeline } from '@solvers/execute';
import type { ExecutablePlan, ExecutionPolicy, NoiseModel } from '@solvers/execute/execution-types';
import type { MapfInstance } from '@solvers/instance';
import { trialLogFromTimeline } from '@solvers/trials/simulated-trial';

/** The instance of a viewer's instance form (rows of '.' and '@', tasks as [x, y]). */
export function instanceOfView(v: ExecutionInstanceView): MapfInstance {
  const passable = new Uint8Array(v.width * v.height);
  v.rows.forEach((row, y) => {
    for (let x = 0; x < v.width; x++) passable[y * v.width + x] = row[x] === '.' ? 1 : 0;
  });
  const at = ([x, y]: readonly [number, number]) => y * v.width + x;
  return {
    grid: { width: v.width, height: v.height, passable },
    agents: v.agents.map((a) => ({ start: at(a.start), goal: at(a.goal), ...(a.startHeading ? { startHeading: a.startHeading } : {}) })),
  };
}

/** `runs` simulated runs (runs 0 … runs − 1 of the batch with `seed`) as CSV trial logs named `${prefix}-NN.csv`. */
export function inventedTrialLogs(
  instance: MapfInstance, plan: ExecutablePlan, profile: RobotProfile,
  options: { readonly policy: ExecutionPolicy; readonly noise: NoiseModel; readonly seed: number; readonly runs: number; readonly prefix: string },
): { name: string; text: string }[] {
  return Array.from({ length: options.runs }, (_, run) => {
    const name = `${options.prefix}-${String(run + 1).padStart(2, '0')}.csv`;
    const timeline = realisedTimeline(instance, plan, profile, { policy: options.policy, noise: options.noise, seed: options.seed }, run);
    const log = trialLogFromTimeline(name, timeline, { withPose: true, cellPitchMm: profile.cellPitchMm });
    return { name, text: formatTrialLogCsv(log.rows) };
  });
}
