/**
 * The leaderboard contract, zod-free so the web bundle can import values from it: the columns a
 * board can show, the filter operators, the view (layout, columns, sort, filters) and its one
 * URL encoding, shared by the page URL, GET /api/leaderboards/rows and GET /api/exports, so a
 * link opens exactly the same view and an export holds exactly the rows and columns on screen.
 */
import { CI95_METHOD, type Interval95 } from './confidence-interval';
import { INTERVAL_NOT_STORED } from './exports-table';
import { PLAN_MODELS, type PlanModel } from './plan';

/** How a column filters: free text, a number, or one of a fixed list. */
export type ColumnKind = 'text' | 'number' | 'enum';

/** Which value is best when comparing plan models in a row: lower (costs, times) or higher (rates). */
export type BetterDirection = 'lower' | 'higher';

/** One column of the instance × model board. */
export interface LeaderboardColumn {
  readonly id: string;
  /** Header for people. */
  readonly label: string;
  readonly kind: ColumnKind;
  /** Allowed values of an enum column. */
  readonly values?: readonly string[];
  /** Unit shown after the header in exports, if any. */
  readonly unit?: string;
  /** For figures: which direction is better (used for the bold best value in comparison tables). */
  readonly better?: BetterDirection;
  /** Digits after the decimal point in exports. */
  readonly digits?: number;
  /** What the figure means, for header tooltips and export notes. */
  readonly description?: string;
  /**
   * Computed for the page from other stored figures (the Wilson interval of a rate): shown and
   * exported, but not sortable or filterable.
   */
  readonly isComputed?: boolean;
}

/** Execution policies with the column-id fragment and label used by per-policy columns. */
export const LEADERBOARD_POLICIES = [
  { policy: 'open-loop', key: 'OpenLoop', label: 'open-loop' },
  { policy: 'lockstep', key: 'Lockstep', label: 'lockstep' },
  { policy: 'dependency-gated', key: 'Gated', label: 'dependency-gated' },
] as const;

/** Outcomes a board row can show. */
export const ENTRY_STATUSES = ['solved', 'infeasible', 'timeout', 'memory', 'error'] as const;

/** Where a row's best result came from. */
export const ENTRY_SOURCES = ['sweep', 'submitted'] as const;
export type EntrySource = (typeof ENTRY_SOURCES)[number];

/** Values of the executable-at-nominal column. */
export const NOMINAL_VALUES = ['yes', 'no', 'not checked'] as const;

/**
 * Values of the optimality column (issue 15, item 1): `proven optimal` = the sum-of-costs equals
 * the best proven lower bound; `bounded` = the best known value of a bounded-suboptimal search
 * (w > 1), within w × the lower bound; `unproven` = no lower bound reaches it (a submitted plan).
 * Empty when nothing was solved.
 */
export const OPTIMALITY_VALUES = ['proven optimal', 'bounded', 'unproven'] as const;
export type Optimality = (typeof OPTIMALITY_VALUES)[number];

/** What the optimality column means, for tooltips, captions and the README. */
export const OPTIMALITY_DESCRIPTION = '"proven optimal": the sum-of-costs equals the proven lower bound. '
  + '"bounded": the best known value of a bounded-suboptimal search with factor w > 1, at most w × the lower bound. '
  + '"unproven": no lower bound reaches it (a submitted plan). Empty: not solved.';

/** An optimality value for people: `bounded (w = 1.5)` for a bounded one, else the value itself. */
export function optimalityLabel(optimality: string | null, suboptimality: number | null): string {
  if (optimality === null) return '';
  return optimality === 'bounded' && suboptimality !== null ? `bounded (w = ${suboptimality})` : optimality;
}

/** What "executable at nominal times" means, for tooltips, captions and the README glossary. */
export const NOMINAL_DESCRIPTION = 'Whether the plan, replayed open-loop with zero noise (no timing jitter, no stalls) under its own robot profile, '
  + 'runs without a collision. "no": it collides even with perfect timing. "not checked": stored before the check existed.';

/** The Wilson-interval columns of one policy: [low id, high id, success column id, policy column suffix]. */
export const SUCCESS_INTERVAL_COLUMNS: readonly (readonly [string, string, string, string])[] = LEADERBOARD_POLICIES.map(
  (p) => [`success${p.key}Lo`, `success${p.key}Hi`, `success${p.key}`, p.policy.replace('-', '_')] as const,
);

/** Why an execution figure has no stored interval; said after INTERVAL_NOT_STORED (shared/exports-table.ts) wherever it shows. */
export const INTERVAL_NOT_STORED_REASON = 'executions recorded before intervals were kept';

/** Description of a mean's stored interval bound (empty when not stored; the grid shows INTERVAL_NOT_STORED). */
const MEAN_BOUND_DESCRIPTION = `Interval of the mean as stored with the execution; empty, shown as ${INTERVAL_NOT_STORED}, for ${INTERVAL_NOT_STORED_REASON}.`;

const policyColumns: LeaderboardColumn[] = LEADERBOARD_POLICIES.flatMap((p) => [
  {
    id: `success${p.key}`, label: `Execution success rate, ${p.label}`, kind: 'number', better: 'higher', digits: 2,
    description: `Share of Monte Carlo runs under ${p.label} with no collision (not the solved rate).`,
  } as const,
  {
    id: `success${p.key}Lo`, label: `Execution success rate, ${p.label}, 95 % CI low`, kind: 'number', digits: 3, isComputed: true,
    description: 'Wilson score interval, recomputed from the rate and the number of runs.',
  } as const,
  {
    id: `success${p.key}Hi`, label: `Execution success rate, ${p.label}, 95 % CI high`, kind: 'number', digits: 3, isComputed: true,
    description: 'Wilson score interval, recomputed from the rate and the number of runs.',
  } as const,
  { id: `spread${p.key}`, label: `Finish spread (mean), ${p.label}`, kind: 'number', unit: 'ms', better: 'lower', digits: 0 } as const,
  {
    id: `spread${p.key}Lo`, label: `Finish spread (mean), ${p.label}, 95 % CI low`, kind: 'number', unit: 'ms', digits: 0,
    description: MEAN_BOUND_DESCRIPTION,
  } as const,
  {
    id: `spread${p.key}Hi`, label: `Finish spread (mean), ${p.label}, 95 % CI high`, kind: 'number', unit: 'ms', digits: 0,
    description: MEAN_BOUND_DESCRIPTION,
  } as const,
  { id: `realised${p.key}`, label: `Realised makespan (mean), ${p.label}`, kind: 'number', unit: 'ms', better: 'lower', digits: 0 } as const,
  {
    id: `realised${p.key}Lo`, label: `Realised makespan (mean), ${p.label}, 95 % CI low`, kind: 'number', unit: 'ms', digits: 0,
    description: MEAN_BOUND_DESCRIPTION,
  } as const,
  {
    id: `realised${p.key}Hi`, label: `Realised makespan (mean), ${p.label}, 95 % CI high`, kind: 'number', unit: 'ms', digits: 0,
    description: MEAN_BOUND_DESCRIPTION,
  } as const,
]);

/**
 * Column ids renamed when sum-of-costs, makespan and lower bound were split by unit (issue 12,
 * item 7): old links get an error naming the new ids instead of a column mixing steps and ms.
 */
export const RENAMED_COLUMNS: Readonly<Record<string, string>> = {
  soc: 'socSteps and socMs', makespan: 'makespanSteps and makespanMs', lowerBound: 'lowerBoundSteps and lowerBoundMs',
};

const STEPS = 'steps (classic, uniform-duration, orientation-split, k-robust)';
const MS = 'ms (weighted-split plans, whose costs are times)';

/** Every column of the instance × model layout, in default order. */
export const ENTRY_COLUMNS: readonly LeaderboardColumn[] = [
  { id: 'map', label: 'Map', kind: 'text' },
  { id: 'scenario', label: 'Scenario', kind: 'text' },
  { id: 'agents', label: 'Agents', kind: 'number', digits: 0 },
  { id: 'model', label: 'Plan model', kind: 'enum', values: PLAN_MODELS },
  { id: 'variant', label: 'Variant', kind: 'text' },
  { id: 'profile', label: 'Robot profile', kind: 'text' },
  { id: 'status', label: 'Status', kind: 'enum', values: ENTRY_STATUSES },
  {
    id: 'executableAtNominal', label: 'Executable at nominal times', kind: 'enum', values: NOMINAL_VALUES, description: NOMINAL_DESCRIPTION,
  },
  {
    id: 'nominalCollisions', label: 'Collisions at nominal times', kind: 'number', better: 'lower', digits: 0,
    description: 'Collisions of the zero-noise open-loop replay (empty: not checked).',
  },
  { id: 'socSteps', label: 'Sum-of-costs', kind: 'number', unit: 'steps', better: 'lower', digits: 0, description: `Sum-of-costs in ${STEPS}.` },
  { id: 'socMs', label: 'Sum-of-costs', kind: 'number', unit: 'ms', better: 'lower', digits: 0, description: `Sum-of-costs in ${MS}.` },
  { id: 'makespanSteps', label: 'Makespan', kind: 'number', unit: 'steps', better: 'lower', digits: 0, description: `Makespan in ${STEPS}.` },
  { id: 'makespanMs', label: 'Makespan', kind: 'number', unit: 'ms', better: 'lower', digits: 0, description: `Makespan in ${MS}.` },
  { id: 'tiSocMs', label: 'Turn-inclusive SOC', kind: 'number', unit: 'ms', better: 'lower', digits: 0 },
  { id: 'tiMakespanMs', label: 'Turn-inclusive makespan', kind: 'number', unit: 'ms', better: 'lower', digits: 0 },
  { id: 'lowerBoundSteps', label: 'Lower bound', kind: 'number', unit: 'steps', digits: 0, description: `Best proven lower bound on the sum-of-costs, ${STEPS}.` },
  { id: 'lowerBoundMs', label: 'Lower bound', kind: 'number', unit: 'ms', digits: 0, description: `Best proven lower bound on the sum-of-costs, ${MS}.` },
  { id: 'gap', label: 'Gap', kind: 'number', better: 'lower', digits: 3, description: '(sum-of-costs − lower bound) ÷ lower bound, unitless.' },
  { id: 'optimality', label: 'Optimality', kind: 'enum', values: OPTIMALITY_VALUES, description: OPTIMALITY_DESCRIPTION },
  {
    id: 'suboptimality', label: 'Suboptimality factor w', kind: 'number', digits: 3,
    description: 'w of the search: 1 = exact (optimal); w > 1 = bounded-suboptimal, sum-of-costs at most w × the lower bound.',
  },
  { id: 'runtimeMs', label: 'Solve time', kind: 'number', unit: 'ms', better: 'lower', digits: 1 },
  ...policyColumns,
  { id: 'source', label: 'Source', kind: 'enum', values: ENTRY_SOURCES },
  { id: 'solver', label: 'Solver', kind: 'text' },
];

/** Columns shown when a view names none. */
export const DEFAULT_ENTRY_COLUMNS: readonly string[] = [
  'map', 'scenario', 'agents', 'model', 'variant', 'status', 'executableAtNominal', 'socSteps', 'socMs', 'tiMakespanMs',
  'lowerBoundSteps', 'lowerBoundMs', 'gap', 'optimality', 'runtimeMs', 'successOpenLoop', 'successOpenLoopLo', 'successOpenLoopHi', 'spreadOpenLoop', 'source', 'solver',
];

/** Figures a comparison table may put side by side: all in ms or rates, so model columns share a unit. */
export const COMPARE_METRICS = [
  'tiMakespanMs', 'tiSocMs', 'runtimeMs',
  ...LEADERBOARD_POLICIES.flatMap((p) => [`success${p.key}`, `spread${p.key}`, `realised${p.key}`]),
] as const;
export type CompareMetric = (typeof COMPARE_METRICS)[number];

/**
 * Which 95 % interval a comparison figure carries per model cell (issue 12, item 5): `rate` for an
 * execution success rate (Wilson, recomputed per page row from rate × runs), `mean` for a mean
 * realised makespan or finish spread (the Student t interval stored with the execution), null
 * for plan figures (deterministic, no interval).
 */
export function compareIntervalKind(metric: CompareMetric): 'rate' | 'mean' | null {
  if (metric.startsWith('success')) return 'rate';
  return metric.startsWith('realised') || metric.startsWith('spread') ? 'mean' : null;
}

/** One sentence naming the interval method of a comparison figure, for the grid legend and export captions (null: no interval). */
export function compareIntervalNote(metric: CompareMetric): string | null {
  const kind = compareIntervalKind(metric);
  if (kind === 'rate') return `Each value carries its 95 % interval [low, high]: ${CI95_METHOD.rate}, recomputed from that plan's rate × runs.`;
  if (kind === 'mean') {
    return `Each value carries its 95 % interval [low, high] of the mean over runs: ${CI95_METHOD.mean}, as stored with the execution (${INTERVAL_NOT_STORED}: ${INTERVAL_NOT_STORED_REASON}).`;
  }
  return null;
}

/**
 * What the per-model summary's mean execution success rate averages and how its interval is
 * made: the mean over solved instances (one row each) of their execution success rates, with a
 * Student t interval over those instances, so it covers the spread between instances as well as
 * each rate's own Monte Carlo noise; cut to [0, 1]. Also the error band of the execution chart.
 */
export const MEAN_SUCCESS_METHOD = 'mean over solved instances of each instance\'s execution success rate; 95 % interval: Student t over those instances, '
  + 'mean ± t(0.975, n−1)·s/√n with n the instances, cut to [0, 1] (none below 2 instances)';

/** The id of a comparison table's column for one model. */
export function modelColumnId(model: PlanModel): string {
  return `m_${model.replace('-', '_')}`;
}

/** Columns of the comparison layout (rows = instance × robot profile, one column per plan model). */
export function compareColumns(metric: CompareMetric): LeaderboardColumn[] {
  const base = ENTRY_COLUMNS.find((c) => c.id === metric) as LeaderboardColumn;
  return [
    { id: 'map', label: 'Map', kind: 'text' },
    { id: 'scenario', label: 'Scenario', kind: 'text' },
    { id: 'agents', label: 'Agents', kind: 'number', digits: 0 },
    { id: 'profile', label: 'Robot profile', kind: 'text' },
    ...PLAN_MODELS.map((m): LeaderboardColumn => ({
      id: modelColumnId(m), label: m, kind: 'number', unit: base.unit, better: base.better, digits: base.digits,
    })),
  ];
}

/**
 * Which plans "best" considers (best value per row of a comparison, bold in exports, the per-model
 * summary): by default only plans not known to collide at nominal times; `all` on request.
 */
export const BEST_AMONG = ['executable', 'all'] as const;
export type BestAmong = (typeof BEST_AMONG)[number];

/** Board layouts: one row per instance × model, or models side by side for one figure. */
export const LAYOUTS = ['entries', 'compare'] as const;
export type Layout = (typeof LAYOUTS)[number];

/** Filter operators by column kind. `has` = contains (any case); `in` = one of a comma list. */
export const FILTER_OPS = {
  text: ['has', 'eq'],
  number: ['eq', 'ne', 'lt', 'lte', 'gt', 'gte', 'blank', 'set'],
  enum: ['in'],
} as const;
export type FilterOp = (typeof FILTER_OPS)[ColumnKind][number];

/** One filter condition on a column. */
export interface ViewFilter {
  readonly column: string;
  readonly op: FilterOp;
  /** The operand as text (a comma list for `in`; empty for blank/set). */
  readonly value: string;
}

/** One sort key. */
export interface ViewSort {
  readonly column: string;
  readonly direction: 'asc' | 'desc';
}

/** A board view: what the URL of a shared link holds. */
export interface LeaderboardView {
  readonly layout: Layout;
  /** Comparison layout: the figure in the model columns. */
  readonly metric: CompareMetric;
  /** Comparison layout: the k of the k-robust column. */
  readonly k: number;
  /** Visible columns in order. */
  readonly columns: readonly string[];
  readonly sort: readonly ViewSort[];
  readonly filters: readonly ViewFilter[];
  /** Which plans "best" considers (URL `bestAmong=all`; default executable ones only). */
  readonly bestAmong: BestAmong;
}

/** The view a board opens with. */
export const DEFAULT_VIEW: LeaderboardView = {
  layout: 'entries', metric: 'tiMakespanMs', k: 1, columns: DEFAULT_ENTRY_COLUMNS, sort: [], filters: [], bestAmong: 'executable',
};

/** The columns of a layout. */
export function columnsOf(view: Pick<LeaderboardView, 'layout' | 'metric'>): readonly LeaderboardColumn[] {
  return view.layout === 'compare' ? compareColumns(view.metric) : ENTRY_COLUMNS;
}

/** A problem with a view parameter, naming the parameter. */
export class ViewParamError extends Error {
  constructor(readonly param: string, message: string) {
    super(message);
    this.name = 'ViewParamError';
  }
}

/** Query parameters that are not part of a view (paging, export format) and are ignored by parseView. */
export const NON_VIEW_PARAMS = new Set(['start', 'end', 'format', 'mapId', 'profile', 'policy', 'limit', 'count']);

/**
 * Reads a view from query parameters (`layout`, `metric`, `k`, `cols=a,b`, `sort=a,-b`,
 * `<column>.<op>=<value>`). Throws ViewParamError naming the bad parameter.
 */
export function parseView(params: Readonly<Record<string, string | undefined>>): LeaderboardView {
  const layout = (params['layout'] ?? 'entries') as Layout;
  if (!LAYOUTS.includes(layout)) throw new ViewParamError('layout', `layout must be one of ${LAYOUTS.join(', ')}, got "${layout}"`);
  const metric = (params['metric'] ?? DEFAULT_VIEW.metric) as CompareMetric;
  if (!COMPARE_METRICS.includes(metric)) throw new ViewParamError('metric', `metric must be one of ${COMPARE_METRICS.join(', ')}, got "${metric}"`);
  const kText = params['k'] ?? '1';
  const k = Number(kText);
  if (!/^\d{1,2}$/.test(kText) || k > 20) throw new ViewParamError('k', `k must be a whole number 0..20, got "${kText}"`);
  const all = columnsOf({ layout, metric });
  const byId = new Map(all.map((c) => [c.id, c]));
  const known = (param: string, id: string): LeaderboardColumn => {
    const col = byId.get(id);
    const renamed = layout === 'entries' ? RENAMED_COLUMNS[id] : undefined;
    if (!col) throw new ViewParamError(param, `unknown column "${id}" for the ${layout} layout${renamed ? ` (split by unit into ${renamed})` : ''}`);
    return col;
  };
  const bestAmong = (params['bestAmong'] ?? 'executable') as BestAmong;
  if (!BEST_AMONG.includes(bestAmong)) throw new ViewParamError('bestAmong', `bestAmong must be one of ${BEST_AMONG.join(', ')}, got "${bestAmong}"`);

  const colsText = params['cols'];
  const columns = colsText === undefined || colsText === ''
    ? (layout === 'compare' ? all.map((c) => c.id) : DEFAULT_ENTRY_COLUMNS)
    : colsText.split(',').map((id) => known('cols', id).id);
  if (new Set(columns).size !== columns.length) throw new ViewParamError('cols', 'a column is listed twice');

  const sort: ViewSort[] = [];
  for (const part of (params['sort'] ?? '').split(',').filter((p) => p !== '')) {
    const desc = part.startsWith('-');
    const id = desc ? part.slice(1) : part;
    if (known('sort', id).isComputed) throw new ViewParamError('sort', `column "${id}" is computed for the page and cannot be sorted`);
    if (sort.some((s) => s.column === id)) throw new ViewParamError('sort', `column "${id}" is sorted twice`);
    sort.push({ column: id, direction: desc ? 'desc' : 'asc' });
  }

  const filters: ViewFilter[] = [];
  for (const [key, raw] of Object.entries(params)) {
    if (raw === undefined || !key.includes('.') || NON_VIEW_PARAMS.has(key)) continue;
    const dot = key.lastIndexOf('.');
    const id = key.slice(0, dot);
    const op = key.slice(dot + 1);
    const col = known(key, id);
    if (col.isComputed) throw new ViewParamError(key, `column "${id}" is computed for the page and cannot be filtered`);
    const ops = FILTER_OPS[col.kind] as readonly string[];
    if (!ops.includes(op)) throw new ViewParamError(key, `column "${id}" filters with ${ops.join(', ')}, not "${op}"`);
    if (col.kind === 'number' && op !== 'blank' && op !== 'set' && !Number.isFinite(Number(raw))) {
      throw new ViewParamError(key, `"${raw}" is not a number`);
    }
    if (col.kind === 'number' && op !== 'blank' && op !== 'set' && raw.trim() === '') throw new ViewParamError(key, 'a number is required');
    if (col.kind === 'enum') {
      const bad = raw.split(',').find((v) => !(col.values ?? []).includes(v));
      if (bad !== undefined) throw new ViewParamError(key, `"${bad}" is not one of ${(col.values ?? []).join(', ')}`);
    }
    filters.push({ column: id, op: op as FilterOp, value: raw });
  }
  filters.sort((a, b) => (a.column + a.op < b.column + b.op ? -1 : 1));
  return { layout, metric, k, columns, sort, filters, bestAmong };
}

/** Writes a view as query parameters (defaults left out), the inverse of parseView. */
export function viewToParams(view: LeaderboardView): Record<string, string> {
  const out: Record<string, string> = {};
  if (view.layout !== 'entries') out['layout'] = view.layout;
  if (view.layout === 'compare') {
    if (view.metric !== DEFAULT_VIEW.metric) out['metric'] = view.metric;
    if (view.k !== 1) out['k'] = String(view.k);
  }
  const defaults = view.layout === 'compare' ? columnsOf(view).map((c) => c.id) : DEFAULT_ENTRY_COLUMNS;
  if (view.columns.join(',') !== defaults.join(',')) out['cols'] = view.columns.join(',');
  if (view.sort.length > 0) out['sort'] = view.sort.map((s) => (s.direction === 'desc' ? '-' : '') + s.column).join(',');
  for (const f of view.filters) out[`${f.column}.${f.op}`] = f.value;
  if (view.bestAmong !== 'executable') out['bestAmong'] = view.bestAmong;
  return out;
}

/** A row of the board: column id → value (numbers, text or null), plus its identity. */
export interface LeaderboardRow {
  /** Stable id of the row (entry id, or `scenario:agents:profile` in the comparison layout). */
  readonly id: string;
  readonly scenarioId: number;
  readonly agents: number;
  readonly profileHash: string;
  /** Entries layout: the row's plan model and variant, which with scenarioId, agents and profileHash name its history (GET /api/history). */
  readonly model?: PlanModel;
  readonly variant?: string;
  /** Entries layout: the best result's id (for the plan viewer). */
  readonly resultId?: number;
  /** Entries layout: whether that result holds a plan (solved); time-limit and failed rows have none to replay. */
  readonly hasPlan?: boolean;
  /** Entries layout: field trial runs attached to that result (issue 17; a count per page row, not a stored column). */
  readonly fieldRuns?: number;
  /** Entries layout: whether the row's plan is collision-free at nominal times (null: not checked). */
  readonly isExecutableAtNominal?: boolean | null;
  /** Comparison layout: per plan model column id, whether its plan is collision-free at nominal times (null: not checked or no plan). */
  readonly isExecutableAtNominalByColumn?: Readonly<Record<string, boolean | null>>;
  /**
   * Comparison layout with an execution figure (compareIntervalKind not null): per plan model
   * column id, the value's 95 % interval, or null when the cell has no value or no interval
   * (a mean whose execution was recorded before intervals were stored, a rate without runs).
   */
  readonly intervalsByColumn?: Readonly<Record<string, Interval95 | null>>;
  readonly cells: Readonly<Record<string, string | number | null>>;
}

/** GET /api/leaderboards/rows: one page of rows and the number of rows of the whole view. */
export interface LeaderboardPage {
  readonly rows: readonly LeaderboardRow[];
  /** Rows of the whole view; -1 when the request said `count=0` (later pages of a grid that knows it). */
  readonly rowCount: number;
  readonly columns: readonly LeaderboardColumn[];
  /** Robot profile hash → label, for the profiles of the rows on this page. */
  readonly profiles: Readonly<Record<string, string>>;
}

/** A robot profile as offered in the board's profile picker. */
export interface ProfileOption {
  readonly hash: string;
  readonly label: string;
  readonly entries: number;
}

/** One model's line of the per-model summary. */
export interface ModelSummary {
  readonly model: PlanModel;
  readonly variant: string;
  /** The suboptimality factor w of the variant (1 = exact search). */
  readonly suboptimality: number;
  /** Solved rows whose sum-of-costs is proven optimal (equals the best proven lower bound); the other solved rows are best known values. */
  readonly provenOptimal: number;
  /** Instances (scenario × agents × profile) with a row for this model. */
  readonly instances: number;
  readonly solved: number;
  /** Per agent count: instances and solved ones, ascending by agents. */
  readonly byAgents: readonly { readonly agents: number; readonly instances: number; readonly solved: number }[];
  /**
   * Mean of (this model's turn-inclusive makespan ÷ classic's) over instances both solved with
   * the same robot profile; null when there is no such pair.
   */
  readonly meanTiMakespanVsClassic: number | null;
  /** Pairs behind meanTiMakespanVsClassic. */
  readonly pairedWithClassic: number;
  /** Mean execution success rate of solved rows per policy (null when none was replayed). */
  readonly meanSuccess: Readonly<Record<string, number | null>>;
  /** Per policy: the 95 % interval of meanSuccess (MEAN_SUCCESS_METHOD), null below 2 instances. */
  readonly meanSuccessCi95: Readonly<Record<string, Interval95 | null>>;
  /** Per policy: the solved instances behind meanSuccess (the n of its interval). */
  readonly meanSuccessInstances: Readonly<Record<string, number>>;
  /** Solved rows whose plan is collision-free at nominal times. */
  readonly executableAtNominal: number;
  /** Solved rows whose plan collides at nominal times. */
  readonly notExecutableAtNominal: number;
}

/** GET /api/leaderboards/summary. */
export interface LeaderboardSummary {
  /**
   * Which rows the ratio and mean execution success rate consider: `executable` leaves out rows
   * (and classic partners) whose plan collides at nominal times.
   */
  readonly bestAmong: BestAmong;
  readonly models: readonly ModelSummary[];
  /** The map this summary is narrowed to (drill-down), or null for all maps. */
  readonly map: { readonly id: number; readonly name: string } | null;
  /** Maps with rows, for the drill-down picker. */
  readonly maps: readonly { readonly id: number; readonly name: string; readonly entries: number }[];
  readonly profiles: readonly ProfileOption[];
}

/** A chart series: one plan model's points. */
export interface ChartSeries {
  readonly model: PlanModel;
  readonly variant: string;
  readonly points: readonly (readonly [number, number])[];
  /** Execution success chart: per point, the 95 % interval of its mean (MEAN_SUCCESS_METHOD), null below 2 instances. */
  readonly intervals?: readonly (Interval95 | null)[];
}

/** GET /api/leaderboards/charts: the data of the four charts for one robot profile. */
export interface LeaderboardCharts {
  /** The robot profile every figure comes from. */
  readonly profile: ProfileOption | null;
  /** The execution policy of the execution figures. */
  readonly policy: string;
  /** [agents, solved rate] per model: the share of instances solved (not execution success). */
  readonly successByAgents: readonly ChartSeries[];
  /** [agents, mean execution success rate] per model. */
  readonly executionSuccessByAgents: readonly ChartSeries[];
  /** [solve time ms, instances solved within it] per model. */
  readonly cactus: readonly ChartSeries[];
  /** [turn-inclusive makespan ms, realised makespan ms] per model (a deterministic sample of at most 500 per model). */
  readonly computedVsRealised: readonly ChartSeries[];
  /** [bin start ms, count] per model; bins of width `spreadBinMs`. */
  readonly spreadHistogram: readonly ChartSeries[];
  readonly spreadBinMs: number;
}

/** A short label of a robot profile for tables and chart captions. */
export function profileLabel(p: {
  readonly forwardMs: number; readonly quarterTurnMs: number; readonly waitMs: number;
  readonly cellPitchMm: number; readonly robotDiameterMm: number; readonly timingJitter: number;
}): string {
  return `forward ${p.forwardMs} ms, quarter turn ${p.quarterTurnMs} ms, wait ${p.waitMs} ms, pitch ${p.cellPitchMm} mm, diameter ${p.robotDiameterMm} mm, jitter ${p.timingJitter}`;
}
