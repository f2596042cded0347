/** The piscina task function: one run in this thread, timed with performance.now. */
import { runPlanTask } from '@solvers/run/run-plan-task';
import type { PlanTask, PlanTaskResult } from '@solvers/run/plan-task';

/** Runs `task` (the pool terminates the thread on the hard time limit or a cancel). */
export default function planThread(task: PlanTask): PlanTaskResult {
  return runPlanTask(task, { now: () => performance.now() });
}
