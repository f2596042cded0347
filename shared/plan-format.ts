/**
 * Quarterturn's plan document (`format: "quarterturn-plan"`, version 1): a plan computed
 * elsewhere for a stored instance (scenario + agent count) and plan model, as submitted to
 * POST /api/submissions. Cells are [x, y] (x = column, y = row, (0, 0) top left).
 * - classic, uniform-duration, k-robust: `paths`, per agent one cell per unit step, the start first, the goal last.
 * - orientation-split: `states`, per agent one [x, y, heading] per unit step.
 * - weighted-split: `schedule`, per agent its timed actions in ms (shared/plan.ts ScheduledAction).
 * A document carries no lower bound: bounds are only ever computed by Quarterturn.
 * The JSON Schema twin is shared/plan-format.schema.json (kept equal by shared/plan-format.spec.ts).
 */
import { z } from 'zod';
import { ACTION_KINDS, HEADINGS } from './plan';
import { RobotProfileSchema } from './sweeps';
import { singleLineText } from './text-field';

const cell = z.tuple([z.number().int(), z.number().int()]);
const heading = z.enum(HEADINGS);
const startHeading = z.enum([...HEADINGS, 'free']).default('free');

/** The solver that produced a plan. */
export const SolverInfoSchema = z.object({
  name: singleLineText().min(1, 'a solver name is required').max(120),
  version: singleLineText().min(1, 'a solver version is required').max(64),
}).strict();

/** Which stored instance a plan is for. */
export const PlanInstanceSchema = z.object({
  scenarioId: z.number().int().positive(),
  agents: z.number().int().positive().max(1000),
}).strict();

const common = {
  format: z.literal('quarterturn-plan'),
  version: z.literal(1),
  instance: PlanInstanceSchema,
  solver: SolverInfoSchema,
  /** Absent: shared/executions-constants.ts STARTER_PROFILE. */
  robotProfile: RobotProfileSchema.optional(),
};

const paths = z.array(z.array(cell).min(1)).max(1000);

const action = z.object({
  action: z.enum(ACTION_KINDS),
  from: cell,
  to: cell,
  heading,
  start: z.number().int().min(0),
  end: z.number().int().min(0),
  step: z.number().int().min(0),
}).strict();

/** A plan document of any model. */
export const PlanDocumentSchema = z.discriminatedUnion('model', [
  z.object({ ...common, model: z.literal('classic'), startHeading, paths }).strict(),
  z.object({ ...common, model: z.literal('uniform-duration'), startHeading, paths }).strict(),
  z.object({ ...common, model: z.literal('k-robust'), k: z.number().int().min(0).max(20), startHeading, paths }).strict(),
  z.object({ ...common, model: z.literal('orientation-split'), startHeading, states: z.array(z.array(z.tuple([z.number().int(), z.number().int(), heading])).min(1)).max(1000) }).strict(),
  z.object({ ...common, model: z.literal('weighted-split'), startHeading, schedule: z.array(z.array(action)).max(1000) }).strict(),
]);
/** A validated plan document. */
export type PlanDocument = z.output<typeof PlanDocumentSchema>;

/** The plan models the text format can carry (paths of cells; orientation-split with a heading per cell). */
export const TEXT_FORMAT_MODELS = ['classic', 'uniform-duration', 'k-robust', 'orientation-split'] as const;

/** POST /api/submissions: a plan file's text and, for the text format, what it is a plan for. */
export const SubmissionRequestSchema = z.discriminatedUnion('format', [
  z.object({
    format: z.literal('json'), fileName: singleLineText().max(255).optional(), text: z.string().min(1, 'the plan file is empty').max(900_000),
    /** Used when the document names no profile; a document naming another one is refused (400, field robotProfile). */
    robotProfile: RobotProfileSchema.optional(),
  }).strict(),
  z.object({
    format: z.literal('text'),
    fileName: singleLineText().max(255).optional(),
    text: z.string().min(1, 'the plan file is empty').max(900_000),
    model: z.enum(TEXT_FORMAT_MODELS),
    k: z.number().int().min(0).max(20).optional(),
    startHeading,
    instance: PlanInstanceSchema,
    solver: SolverInfoSchema,
    robotProfile: RobotProfileSchema.optional(),
  }).strict().refine((r) => r.model !== 'k-robust' || r.k !== undefined, { message: 'k-robust needs k', path: ['k'] }),
]);
/** A validated submission request. */
export type SubmissionRequest = z.output<typeof SubmissionRequestSchema>;
