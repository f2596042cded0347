/**
 * Public API of the fleet execution simulator: seeded, pure, exact disk collision checks.
 * Simulation is no safety assessment: defer to the applicable safety standards and local rules.
 */
export type {
  ChainSegment, Collision, CollisionMode, ExecutablePlan, ExecutionOptions, ExecutionPolicy, ExecutionSummary, MetricStats, NoiseModel,
  RealisedAction, RobotWait, RunMetrics, RunTimeline, WaitReason,
} from './execution-types';
export { EXECUTION_POLICIES } from './execution-types';
export { simulateExecution, summariseRuns } from './simulate-execution';
export { realisedTimeline } from './realised-timeline';
export { ExecutionRunner } from './execution-runner';
export { closestApproach, overlapInterval, type ClosestApproach } from './closest-approach';
export { resolveNoise, runSeed } from './noise';
export { buildActionDependencies, type ActionDependencies } from './dependency-graph';
export { preparePlan, type PreparedPlan } from './prepared-plan';
export { timingFigures, type TimingFigures } from './run-figures';
