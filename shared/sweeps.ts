/**
 * The sweep contract: what a maintainer asks for (a zod schema the web form builds and the API
 * validates), how it expands into runs, and the size rule both sides apply before launch.
 * The same `sweepSize` runs in the browser (live count under the form) and on the server
 * (refusal of absurd sizes), so the two can never disagree.
 */
import { z } from 'zod';
import { FOLLOWING_RULES, HEADINGS, PLAN_MODELS, type PlanModel } from './plan';
import { SolverRefSchema, solverKey } from './external-solvers';
import { singleLineText } from './text-field';

/** Execution policies a sweep may replay plans under (same names as solvers/execute). */
export const SWEEP_POLICIES = ['open-loop', 'lockstep', 'dependency-gated'] as const;
export type SweepPolicy = (typeof SWEEP_POLICIES)[number];

/** Names of the CBS switches a sweep can turn off for ablations (same names as solvers/search/cbs-types). */
export const CBS_SWITCH_NAMES = [
  'prioritizeConflicts', 'bypass', 'wdg', 'disjointSplitting', 'targetReasoning', 'corridorReasoning', 'rectangleReasoning',
] as const;
export type CbsSwitchName = (typeof CBS_SWITCH_NAMES)[number];

/** What people read about one CBS switch: a short label and one sentence on what turning it off removes. */
export interface CbsSwitchText {
  readonly label: string;
  readonly explanation: string;
}

/**
 * Labels of the CBS switches for screens, progress labels and error messages. The identifiers in
 * CBS_SWITCH_NAMES stay the API's field names (the stable contract); people see these. Technique
 * names are kept as published. Papers, cited from memory (not re-checked here):
 * - prioritised conflicts (cardinal conflicts first, ICBS): Boyarski et al., IJCAI 2015;
 * - bypass: Boyarski et al., 2015 (bypassing conflicts, ICAPS 2015 as remembered; also part of ICBS);
 * - WDG heuristic: Li, Felner, Boyarski, Ma, Koenig, IJCAI 2019;
 * - disjoint splitting: Li, Harabor, Stuckey, Ma, Koenig, ICAPS 2019;
 * - rectangle reasoning: Li, Harabor, Stuckey, Ma, Koenig, AAAI 2019;
 * - corridor and target reasoning: Li, Gange, Harabor, Stuckey, Ma, Koenig (ICAPS 2020 as
 *   remembered), all three reasonings together in Li et al., AIJ 2021.
 */
export const CBS_SWITCH_TEXT: Readonly<Record<CbsSwitchName, CbsSwitchText>> = {
  prioritizeConflicts: {
    label: 'Prioritised conflicts',
    explanation: 'Splits first on conflicts that must raise the cost of a node, so the search tree stays small.',
  },
  bypass: {
    label: 'Bypass',
    explanation: 'Keeps a child\'s paths in place of its parent\'s when they cost the same and conflict less, instead of branching.',
  },
  wdg: {
    label: 'WDG heuristic',
    explanation: 'Raises each node\'s cost estimate by what pairs of dependent agents must add between them.',
  },
  disjointSplitting: {
    label: 'Disjoint splitting',
    explanation: 'Branches into "the agent is there" and "the agent is not there", so the two children never share a solution.',
  },
  targetReasoning: {
    label: 'Target reasoning',
    explanation: 'When an agent passes over another\'s goal after that one has stopped there, branches on the length of the stopped agent\'s path.',
  },
  corridorReasoning: {
    label: 'Corridor reasoning',
    explanation: 'Settles two agents meeting head-on in a one-cell-wide passage in one branching, with time-range constraints.',
  },
  rectangleReasoning: {
    label: 'Rectangle reasoning',
    explanation: 'Settles two agents crossing in an open area with many equally short paths in one branching, with barrier constraints.',
  },
};

/** The label of a CBS switch for people, e.g. `WDG heuristic` for `wdg`. */
export function cbsSwitchLabel(name: CbsSwitchName): string {
  return CBS_SWITCH_TEXT[name].label;
}

/** Limits on one sweep, checked by `checkSweepSize` on both sides. */
export const SWEEP_LIMITS = {
  /** Runs (solves) one sweep may expand to. */
  maxRuns: 5000,
  /** Simulated fleet runs in all: runs × policies × Monte Carlo runs. */
  maxSimulations: 2_000_000,
  maxAgents: 1000,
  maxAgentCounts: 200,
  maxSeeds: 100,
  maxMonteCarloRuns: 1000,
  /** Per-run time limit bounds, ms. */
  minTimeLimitMs: 100,
  maxTimeLimitMs: 3_600_000,
  /** Per-run memory limit bounds, MB (the pool's per-thread heap limit). */
  minMemoryLimitMb: 64,
  maxMemoryLimitMb: 16_384,
} as const;

const whole = (min: number, max: number) => z.number().int().min(min).max(max);

/** A start heading rule: one heading for every agent the instance leaves open, or `free`. */
export const StartHeadingSchema = z.enum([...HEADINGS, 'free']);

/** CBS switches to override (absent = on). */
export const CbsSwitchesSchema = z.object(
  Object.fromEntries(CBS_SWITCH_NAMES.map((n) => [n, z.boolean().optional()])) as Record<CbsSwitchName, z.ZodOptional<z.ZodBoolean>>,
).strict();

const unitStepBase = { startHeading: StartHeadingSchema.default('free'), switches: CbsSwitchesSchema.default({}) };

/**
 * The following rule of classic, uniform-duration and orientation-split (shared/plan.ts
 * FOLLOWING_RULES; Stern et al., SoCS 2019). Optional, absent = allowed (definitions stored
 * before the rule existed lack it, so readers write `following ?? 'allowed'`); an allowed spec
 * is hashed and stored exactly as before the rule existed (see `runParameters`).
 */
export const FollowingRuleSchema = z.enum(FOLLOWING_RULES);
const followingBase = { following: FollowingRuleSchema.optional() };

/** Bounds of the suboptimality factor w of bounded-suboptimal search (issue 15, item 1). */
export const SUBOPTIMALITY_LIMITS = { min: 1, max: 10 } as const;

/** What w means, for help texts and tooltips. */
export const SUBOPTIMALITY_HELP = 'w ≥ 1; 1 = optimal; results are within w × the proven lower bound';

/**
 * The suboptimality factor w of every plan model: the search may return a plan whose sum-of-costs
 * is at most w times the lower bound it proves. Optional, absent = 1 (exact search, as before
 * the factor existed); w = 1 is hashed and stored exactly as a spec without it (see `runParameters`).
 */
export const SuboptimalitySchema = z.number({ error: 'suboptimality (w) must be a number from 1 to 10' })
  .min(SUBOPTIMALITY_LIMITS.min, `suboptimality (w) must be at least ${SUBOPTIMALITY_LIMITS.min} (1 = optimal)`)
  .max(SUBOPTIMALITY_LIMITS.max, `suboptimality (w) must be at most ${SUBOPTIMALITY_LIMITS.max}`)
  // Short labels and variant names (`w=1.25`); finer factors tell results apart by nothing a reader can see.
  .refine((w) => Math.abs(w * 1000 - Math.round(w * 1000)) < 1e-9, 'suboptimality (w) takes at most 3 decimals, e.g. 1.25');
const suboptimalityBase = { suboptimality: SuboptimalitySchema.optional() };

/**
 * A registered external solver that computes this model's plans instead of Quarterturn's own
 * search (issue 16, item 4; shared/external-solvers.ts). Optional, absent = built-in: a built-in
 * spec is hashed and stored exactly as before the field existed. Present, it is part of the run
 * params (params.model.externalSolver), so the solver's results are their own board variant.
 */
const externalBase = { externalSolver: SolverRefSchema.optional() };

/** One plan model with its parameters. */
export const ModelSpecSchema = z.discriminatedUnion('model', [
  z.object({ model: z.literal('classic'), ...unitStepBase, ...followingBase, ...suboptimalityBase, ...externalBase }).strict(),
  z.object({ model: z.literal('uniform-duration'), ...unitStepBase, ...followingBase, ...suboptimalityBase, ...externalBase }).strict(),
  z.object({ model: z.literal('orientation-split'), ...unitStepBase, ...followingBase, ...suboptimalityBase, ...externalBase }).strict(),
  z.object({ model: z.literal('weighted-split'), startHeading: StartHeadingSchema.default('free'), ...suboptimalityBase, ...externalBase }).strict(),
  z.object({ model: z.literal('k-robust'), k: whole(0, 20), ...unitStepBase, ...suboptimalityBase, ...externalBase }).strict(),
]).superRefine((m, ctx) => {
  // Switches, w and the following rule steer Quarterturn's own search; an external solver gets
  // only the instance, the model, k, the start heading and the limits, so they would be promises
  // nobody keeps. Refused rather than ignored.
  if (!m.externalSolver) return;
  if (isBounded(m)) ctx.addIssue({ code: 'custom', path: ['suboptimality'], message: 'an external solver takes no suboptimality (w); leave it at 1' });
  if (forbidsFollowing(m)) ctx.addIssue({ code: 'custom', path: ['following'], message: 'an external solver is checked under the classic following rule; leave following allowed' });
  if (switchesOff(m).length > 0) ctx.addIssue({ code: 'custom', path: ['switches'], message: 'CBS switches belong to the built-in search; an external solver takes none' });
});
export type ModelSpec = z.output<typeof ModelSpecSchema>;

/** The robot profile of a sweep (times in ms, lengths in mm; see shared/plan.ts RobotProfile). */
export const RobotProfileSchema = z.object({
  forwardMs: whole(1, 600_000),
  quarterTurnMs: whole(1, 600_000),
  waitMs: whole(1, 600_000),
  cellPitchMm: z.number().positive().max(100_000),
  robotDiameterMm: z.number().positive().max(100_000),
  timingJitter: z.number().min(0).max(2),
}).strict();

/** Agent counts: an explicit list, or a range from..to by step (both ends included when reached). */
export const AgentCountsSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('list'), values: z.array(whole(1, SWEEP_LIMITS.maxAgents)).min(1).max(SWEEP_LIMITS.maxAgentCounts) }).strict(),
  z.object({ kind: z.literal('range'), from: whole(1, SWEEP_LIMITS.maxAgents), to: whole(1, SWEEP_LIMITS.maxAgents), step: whole(1, SWEEP_LIMITS.maxAgents) }).strict()
    .refine((r) => r.to >= r.from, { message: 'the range must not end before it starts', path: ['to'] }),
]);

/** Which instances: an instance set, optionally narrowed to some of its scenarios. */
export const SweepInstancesSchema = z.object({
  instanceSetId: z.number().int().positive(),
  /** Scenario ids of that set; absent or empty = every scenario of the set. */
  scenarioIds: z.array(z.number().int().positive()).max(SWEEP_LIMITS.maxRuns).optional(),
}).strict();

/** Execution replay settings: policies, timing noise and Monte Carlo runs per policy. */
export const SweepExecutionSchema = z.object({
  policies: z.array(z.enum(SWEEP_POLICIES)).max(3).default([]),
  /** Coefficient of variation of action durations; absent = the profile's timing jitter. */
  jitterCv: z.number().min(0).max(2).optional(),
  stallProbability: z.number().min(0).max(1).default(0),
  stallMs: whole(0, 600_000).default(0),
  runs: whole(1, SWEEP_LIMITS.maxMonteCarloRuns).default(20),
}).strict();

/** POST /api/sweeps: the definition of a sweep. */
export const SweepDefinitionSchema = z.object({
  name: singleLineText().min(1, 'a name is required').max(120),
  instances: SweepInstancesSchema,
  agentCounts: AgentCountsSchema,
  models: z.array(ModelSpecSchema).min(1, 'choose at least one plan model').max(20),
  robotProfile: RobotProfileSchema,
  timeLimitMs: whole(SWEEP_LIMITS.minTimeLimitMs, SWEEP_LIMITS.maxTimeLimitMs),
  memoryLimitMb: whole(SWEEP_LIMITS.minMemoryLimitMb, SWEEP_LIMITS.maxMemoryLimitMb),
  execution: SweepExecutionSchema.default({ policies: [], stallProbability: 0, stallMs: 0, runs: 20 }),
  seeds: z.array(z.number().int().min(0).max(0xffffffff)).min(1).max(SWEEP_LIMITS.maxSeeds).default([1]),
}).strict().superRefine((def, ctx) => {
  // In the schema, so preview, launch and the web form apply the one rule (issue 13, item 8).
  for (const repeat of repeatedModels(def.models)) ctx.addIssue({ code: 'custom', path: ['models', repeat.index], message: repeat.message });
});
/** A validated sweep definition (defaults filled in). */
export type SweepDefinition = z.output<typeof SweepDefinitionSchema>;
/** A sweep definition as a client may send it (defaults optional). */
export type SweepDefinitionInput = z.input<typeof SweepDefinitionSchema>;

/** CBS switches a unit-step spec turns off, in CBS_SWITCH_NAMES order (a switch set to true is the same as absent). */
export function switchesOff(m: ModelSpec): CbsSwitchName[] {
  return 'switches' in m ? CBS_SWITCH_NAMES.filter((n) => m.switches[n] === false) : [];
}

/** Whether a spec forbids following (stored definitions from before the rule lack the field: allowed). */
export function forbidsFollowing(m: ModelSpec): boolean {
  return 'following' in m && m.following === 'forbidden';
}

/** The suboptimality factor w of a spec (absent = 1, exact search). */
export function suboptimalityOf(m: ModelSpec): number {
  return m.suboptimality ?? 1;
}

/** Whether a spec asks for bounded-suboptimal search (w > 1). */
export function isBounded(m: ModelSpec): boolean {
  return suboptimalityOf(m) > 1;
}

/**
 * A model spec for people, e.g. "k-robust k=2, start heading free, switched off: Bypass, WDG heuristic"
 * or "classic, w = 1.2, start heading free".
 */
export function describeModelSpec(m: ModelSpec): string {
  const off = switchesOff(m);
  return [
    `${m.model}${'k' in m ? ` k=${m.k}` : ''}`,
    ...(m.externalSolver ? [`by ${solverKey(m.externalSolver)}`] : []),
    ...(isBounded(m) ? [`w = ${suboptimalityOf(m)}`] : []),
    `start heading ${m.startHeading}`,
    ...(forbidsFollowing(m) ? ['following forbidden'] : []),
    ...(off.length > 0 ? [`switched off: ${off.map(cbsSwitchLabel).join(', ')}`] : []),
  ].join(', ');
}

/**
 * Every spec that asks for the same runs as an earlier one (same model, k, start heading and
 * switches turned off), with a sentence naming both. Such a sweep would compute everything
 * twice, and when both specs are written alike their runs share one identity, which the runs
 * table refuses (launch answered a bare 409).
 */
export function repeatedModels(models: readonly ModelSpec[]): { readonly index: number; readonly message: string }[] {
  const first = new Map<string, number>();
  const repeats: { index: number; message: string }[] = [];
  models.forEach((m, index) => {
    const key = canonicalJson({
      model: m.model, k: 'k' in m ? m.k : undefined, startHeading: m.startHeading, off: switchesOff(m),
      following: forbidsFollowing(m) ? 'forbidden' : undefined,
      w: isBounded(m) ? suboptimalityOf(m) : undefined,
      external: m.externalSolver ? solverKey(m.externalSolver) : undefined,
    });
    const earlier = first.get(key);
    if (earlier === undefined) first.set(key, index);
    else repeats.push({ index, message: `models[${index}] repeats models[${earlier}]: ${describeModelSpec(m)}` });
  });
  return repeats;
}

/** The distinct agent counts of a definition, ascending. */
export function agentCountsOf(counts: SweepDefinition['agentCounts']): number[] {
  const values: number[] = [];
  if (counts.kind === 'list') values.push(...counts.values);
  else for (let k = counts.from; k <= counts.to && values.length <= SWEEP_LIMITS.maxAgentCounts; k += counts.step) values.push(k);
  return [...new Set(values)].sort((a, b) => a - b);
}

/** What expansion needs to know about a scenario. */
export interface ScenarioCapacity {
  readonly id: number;
  /** Largest agent count the scenario can give. */
  readonly maxAgents: number;
}

/** One run before it is stored: an instance (scenario + agent count), a model and a seed. */
export interface RunSpec {
  readonly scenarioId: number;
  readonly agents: number;
  /** Index into definition.models. */
  readonly modelIndex: number;
  readonly model: PlanModel;
  readonly seed: number;
}

/** How big a sweep is. */
export interface SweepSize {
  /** Runs it expands to. */
  readonly runs: number;
  /** (scenario, agent count) pairs dropped because the scenario has fewer rows than agents. */
  readonly skippedInstances: number;
  /** Simulated fleet runs: runs × policies × Monte Carlo runs. */
  readonly simulations: number;
}

/** The scenarios a definition picks from the given ones (all when it names none). */
function chosenScenarios(def: SweepDefinition, scenarios: readonly ScenarioCapacity[]): ScenarioCapacity[] {
  const ids = def.instances.scenarioIds;
  if (!ids || ids.length === 0) return [...scenarios];
  const wanted = new Set(ids);
  return scenarios.filter((s) => wanted.has(s.id));
}

/** Counts the runs of `def` over `scenarios` without listing them. */
export function sweepSize(def: SweepDefinition, scenarios: readonly ScenarioCapacity[]): SweepSize {
  const counts = agentCountsOf(def.agentCounts);
  let instances = 0;
  let skipped = 0;
  for (const s of chosenScenarios(def, scenarios)) {
    for (const k of counts) {
      if (k <= s.maxAgents) instances++;
      else skipped++;
    }
  }
  const runs = instances * def.models.length * def.seeds.length;
  return { runs, skippedInstances: skipped, simulations: runs * def.execution.policies.length * def.execution.runs };
}

/** A sentence saying why the size is refused, or null when it is acceptable. */
export function checkSweepSize(size: SweepSize): string | null {
  if (size.runs === 0) return 'This sweep expands to no runs: no chosen scenario has enough rows for the agent counts.';
  if (size.runs > SWEEP_LIMITS.maxRuns) {
    return `This sweep expands to ${size.runs.toLocaleString('en')} runs; at most ${SWEEP_LIMITS.maxRuns.toLocaleString('en')} are allowed. Choose fewer scenarios, agent counts, models or seeds.`;
  }
  if (size.simulations > SWEEP_LIMITS.maxSimulations) {
    return `This sweep asks for ${size.simulations.toLocaleString('en')} simulated fleet runs; at most ${SWEEP_LIMITS.maxSimulations.toLocaleString('en')} are allowed. Lower the Monte Carlo runs or the policies.`;
  }
  return null;
}

/** Lists every run of `def` over `scenarios` in a fixed order (scenario, agents, model, seed). */
export function expandSweep(def: SweepDefinition, scenarios: readonly ScenarioCapacity[]): RunSpec[] {
  const counts = agentCountsOf(def.agentCounts);
  const runs: RunSpec[] = [];
  for (const s of chosenScenarios(def, scenarios)) {
    for (const agents of counts) {
      if (agents > s.maxAgents) continue;
      def.models.forEach((m, modelIndex) => {
        for (const seed of def.seeds) runs.push({ scenarioId: s.id, agents, modelIndex, model: m.model, seed });
      });
    }
  }
  return runs;
}

/** Stable JSON: object keys sorted at every depth, so equal values always give equal text. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
}

/**
 * The parameters that make two runs of one instance, model and seed the same run: the model's
 * parameters, the robot profile and the limits. Hashed (see api/src/sweeps/parameter-hash.ts)
 * into the run's identity and stored as the result's params (the leaderboard variant reads
 * them). `following: 'allowed'` (the default) is left out, so runs and results of the classic
 * rule keep the params and hash they had before the following rule existed; only
 * `following: 'forbidden'` appears (params.model.following). Likewise `suboptimality: 1` (exact
 * search, the default) is left out and only w > 1 appears (params.model.suboptimality).
 */
export function runParameters(def: SweepDefinition, modelIndex: number): Record<string, unknown> {
  return { model: modelParameters(def.models[modelIndex]), robotProfile: def.robotProfile, timeLimitMs: def.timeLimitMs, memoryLimitMb: def.memoryLimitMb };
}

/**
 * A model spec as stored in run params: without `following` when it is the default (allowed) and
 * without `suboptimality` when it is 1 (exact).
 */
export function modelParameters(m: ModelSpec): Readonly<Record<string, unknown>> {
  const isDefaultFollowing = 'following' in m && m.following !== 'forbidden';
  const isDefaultW = m.suboptimality !== undefined && m.suboptimality <= 1;
  if (!isDefaultFollowing && !isDefaultW) return m;
  const rest: Record<string, unknown> = { ...m };
  if (isDefaultFollowing) delete rest.following;
  if (isDefaultW) delete rest.suboptimality;
  return rest;
}

/** Whether a model name is one of PLAN_MODELS. */
export function isPlanModel(v: string): v is PlanModel {
  return (PLAN_MODELS as readonly string[]).includes(v);
}
