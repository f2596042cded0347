/**
 * Public API of field trials: checking a trial log against its plan with the simulator's per-run
 * figures, and fitting a robot profile to trial logs. The log format itself is shared/trial-log.ts.
 * Simulation is no safety assessment, and neither is a trial of a few runs.
 */
export {
  compareTrialToPlan, type TrialCollision, type TrialComparison, type TrialDivergence, type TrialRobotFigures, type TrialRunFigures,
} from './compare-to-plan';
export {
  calibrateProfile, calibrationSummary, CALIBRATION_KINDS, profileFromFit, QQ_POINTS, type CalibrationKind, type CalibrationResult,
  type CalibrationSummary, type ProfileFit, type QqPoint,
} from './calibrate';
export { trialLogFromTimeline, type SimulatedTrialOptions } from './simulated-trial';
