/**
 * Every route under /api with the zod schemas that validate its input (issue 16, item 2). The
 * OpenAPI document is generated from this list (openapi-document.ts), and
 * openapi-document.spec.ts walks the app's real router and fails when a route is missing here or
 * an example does not pass its schema. A new route adds one entry.
 *
 * Query strings the routers read by hand (boards, exports, reports) are described with zod here,
 * so the document shows them; the routers' own checks stay the source of truth for those.
 */
import { z } from 'zod';
import { AccountSettingsRequest, ChangeRoleRequest, type Role } from '@shared/auth';
import { CreateApiTokenRequest } from '@shared/api-tokens';
import { PLAN_DOWNLOAD_FORMATS } from '@shared/result-plan-view';
import { InstanceExecutionRequestSchema, ResultExecutionRequestSchema } from '@shared/executions';
import { EXPORT_FORMATS } from '@shared/exports-table';
import { ExternalSolverRequestSchema } from '@shared/external-solvers';
import { SaveRobotProfileRequest, TrialUploadFields } from '@shared/field-trials';
import { PUBLISHED_SCHEMAS } from '@shared/help';
import { HistoryQuery } from '@shared/history';
import { CreateInstanceSetRequest, GenerateInstancesRequest, InstanceSetListQuery, UpdateInstanceSetRequest } from '@shared/instance-sets';
import { BEST_AMONG, LEADERBOARD_POLICIES } from '@shared/leaderboards';
import { SubmissionRequestSchema } from '@shared/plan-format';
import { REPORT_FORMATS, REPORT_POLICIES } from '@shared/reports';
import { ChangeQuotaRequest } from '@shared/storage-quota';
import { SweepDefinitionSchema } from '@shared/sweeps';
import { BATCH_UPLOAD_FIELD, BatchManifestSchema } from '@shared/submission-batch-format';
import { ProfilesQuery } from '../submissions/instance-profiles';
import { CalibrationRequest } from '../trials/trials.router';
import { AccountSchema, ApiTokenViewSchema, documented, HealthResponseSchema, MeResponseSchema } from './response-schemas';

/** A request or response body: its schema, media type and, for requests, an example that passes the schema. */
export interface BodySpec {
  readonly schema: z.ZodType;
  /** Default application/json. */
  readonly contentType?: string;
  readonly example?: unknown;
}

/** The success answer of a route. */
export interface ResponseSpec {
  readonly status: 200 | 201 | 202 | 204 | 302;
  readonly description: string;
  readonly body?: BodySpec;
}

/** One route under /api. */
export interface ApiRoute {
  readonly method: 'get' | 'post' | 'patch' | 'delete';
  /** OpenAPI form, path parameters in braces: `/api/sweeps/{id}`. */
  readonly path: string;
  readonly tag: string;
  readonly summary: string;
  /** The least role that may call it (`visitor`: anyone). */
  readonly role: Role;
  /** Whether only a browser session may call it (token routes, sign-in and sign-out). */
  readonly isSessionOnly?: boolean;
  readonly params?: z.ZodObject;
  readonly query?: z.ZodObject;
  /** Example of the query, checked against `query`. */
  readonly queryExample?: Record<string, unknown>;
  readonly body?: BodySpec;
  /** A second media type the route takes instead of `body` (e.g. a zip in multipart/form-data beside a JSON body). */
  readonly alsoAccepts?: BodySpec;
  readonly response: ResponseSpec;
}

const id = z.object({ id: z.coerce.number().int().positive().max(2_147_483_647).meta({ description: 'Numeric id.', example: 7 }) });
const resultId = z.object({ resultId: z.coerce.number().int().positive().max(2_147_483_647).meta({ description: 'A stored sweep result.', example: 42 }) });
const json = (typeName: string, where = 'shared/') => ({ body: { schema: documented(typeName, where) } });
const file = (contentType: string, description: string): BodySpec => ({ schema: z.string().meta({ description }), contentType });

const boardScope = {
  profile: z.string().regex(/^[0-9a-f]{16}$/).optional().meta({ description: 'Robot profile hash (16 hex digits).' }),
  mapId: z.coerce.number().int().min(0).optional(),
};
/** GET /api/leaderboards/rows and GET /api/exports (shared/leaderboards.ts parseView). */
const BoardViewQuery = z.object({
  layout: z.enum(['entries', 'compare']).optional(),
  cols: z.string().optional().meta({ description: 'Comma list of column ids.' }),
  sort: z.string().optional().meta({ description: 'Comma list of column ids, `-` before an id sorts descending.' }),
  metric: z.string().optional(),
  k: z.string().optional(),
  bestAmong: z.enum(BEST_AMONG).optional(),
  start: z.coerce.number().int().min(0).optional(),
  end: z.coerce.number().int().min(1).optional(),
  count: z.enum(['0', '1']).optional().meta({ description: '`0` skips counting the rows.' }),
  ...boardScope,
}).catchall(z.string()).meta({ description: 'A board view; filters are `COLUMN.OP=VALUE` (e.g. `source.in=submitted`).' });

const SWEEP_EXAMPLE = {
  name: 'depot aisle check',
  instances: { instanceSetId: 3 },
  agentCounts: { kind: 'list', values: [2, 4] },
  // The third spec: the demo's external solver computes classic plans (issue 16, item 4).
  models: [{ model: 'classic' }, { model: 'orientation-split' }, { model: 'classic', externalSolver: { name: 'prioritised-astar', version: '1.0.0' } }],
  robotProfile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0.1 },
  timeLimitMs: 10_000,
  memoryLimitMb: 256,
  execution: { policies: ['open-loop'], runs: 5 },
  seeds: [1],
};

/** A registration as the demo seed makes it (api/src/demo/demo-external-solver.ts). */
const EXTERNAL_SOLVER_EXAMPLE = {
  name: 'prioritised-astar',
  version: '1.0.0',
  models: ['classic'],
  command: '{node} --import tsx solvers/cli/external-example/prioritised-astar.ts --map {map} --scenario {scenario} --agents {agents} --plan {plan} --time-limit-ms {timeLimitMs}',
  planFormat: 'text',
  description: 'Prioritised planning with space-time A*.',
};

/** A JSON batch of two text plans for the same solver (shared/submission-batch-format.ts). */
const BATCH_EXAMPLE = {
  format: 'quarterturn-plan-batch',
  version: 1,
  defaults: { set: 'Depot aisles', model: 'classic', solver: { name: 'My planner', version: '0.3' } },
  plans: [
    { text: '(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n', instance: { map: 'aisle.map', scenario: 'aisle-1.scen', agents: 2 } },
    { text: '(0,0) (0,1)\n', instance: { scenarioId: 12, agents: 1 }, model: 'k-robust', k: 1 },
  ],
};

/** Every route under /api. */
export const API_ROUTES: readonly ApiRoute[] = [
  // Platform
  { method: 'get', path: '/api/health', tag: 'platform', summary: 'Whether the app and its database answer', role: 'visitor', response: { status: 200, description: 'Health', body: { schema: HealthResponseSchema } } },
  { method: 'get', path: '/api/stats', tag: 'platform', summary: 'Counts for the home page (public data only for visitors)', role: 'visitor', response: { status: 200, description: 'Counts', ...json('StatsResponse', 'shared/auth-contract.ts') } },
  { method: 'get', path: '/api/openapi.json', tag: 'platform', summary: 'This document', role: 'visitor', response: { status: 200, description: 'OpenAPI 3.1 document', ...json('OpenAPI document', 'this API') } },
  { method: 'get', path: '/api/help/guide', tag: 'platform', summary: 'The user guide as Markdown', role: 'visitor', response: { status: 200, description: 'Markdown', body: file('text/markdown', 'The guide') } },
  {
    method: 'get', path: '/api/schemas/{name}', tag: 'platform', summary: 'A published JSON Schema (plan, instance and trial-log formats)', role: 'visitor',
    params: z.object({ name: z.enum(PUBLISHED_SCHEMAS) }),
    response: { status: 200, description: 'JSON Schema (draft 2020-12)', body: { schema: z.looseObject({}), contentType: 'application/schema+json' } },
  },

  // Account
  { method: 'get', path: '/api/auth/github', tag: 'account', summary: 'Start signing in (browser only)', role: 'visitor', isSessionOnly: true, response: { status: 302, description: 'Redirect to the sign-in provider' } },
  { method: 'get', path: '/api/auth/github/callback', tag: 'account', summary: 'Sign-in provider callback (browser only)', role: 'visitor', isSessionOnly: true, response: { status: 302, description: 'Redirect into the app' } },
  { method: 'post', path: '/api/auth/logout', tag: 'account', summary: 'Sign out (browser only)', role: 'visitor', isSessionOnly: true, response: { status: 204, description: 'Signed out' } },
  { method: 'get', path: '/api/me', tag: 'account', summary: 'Who is calling, and the role', role: 'visitor', response: { status: 200, description: 'The account or a visitor', body: { schema: MeResponseSchema } } },
  {
    method: 'patch', path: '/api/me/settings', tag: 'account', summary: 'Switch sweep e-mails on or off', role: 'researcher',
    body: { schema: AccountSettingsRequest, example: { isEmailOn: false } },
    response: { status: 200, description: 'The updated account', body: { schema: MeResponseSchema } },
  },
  { method: 'get', path: '/api/me/tokens', tag: 'account', summary: 'Your API tokens that are not revoked', role: 'researcher', isSessionOnly: true, response: { status: 200, description: 'Tokens, newest first', body: { schema: z.object({ tokens: z.array(ApiTokenViewSchema) }) } } },
  {
    method: 'post', path: '/api/me/tokens', tag: 'account', summary: 'Create an API token; the answer holds its secret, shown only this once', role: 'researcher', isSessionOnly: true,
    body: { schema: CreateApiTokenRequest, example: { name: 'nightly solver run', scopes: ['read', 'submit'], expiresInDays: 90 } },
    response: { status: 201, description: 'The token and its secret', body: { schema: z.object({ token: ApiTokenViewSchema, secret: z.string().regex(/^qtk_[A-Za-z0-9_-]{43}$/) }) } },
  },
  { method: 'delete', path: '/api/me/tokens/{id}', tag: 'account', summary: 'Revoke one of your API tokens', role: 'researcher', isSessionOnly: true, params: id, response: { status: 204, description: 'Revoked' } },

  // Admin
  { method: 'get', path: '/api/admin/users', tag: 'admin', summary: 'Every account', role: 'admin', response: { status: 200, description: 'Accounts', body: { schema: z.object({ users: z.array(AccountSchema) }) } } },
  {
    method: 'patch', path: '/api/admin/users/{id}', tag: 'admin', summary: "Change a person's role", role: 'admin', params: id,
    body: { schema: ChangeRoleRequest, example: { role: 'maintainer' } },
    response: { status: 200, description: 'The updated account', body: { schema: AccountSchema } },
  },
  { method: 'get', path: '/api/admin/users/{id}/quota', tag: 'admin', summary: "A person's storage quota and use", role: 'admin', params: id, response: { status: 200, description: 'Quota', ...json('StorageQuotaView', 'shared/storage-quota.ts') } },
  {
    method: 'patch', path: '/api/admin/users/{id}/quota', tag: 'admin', summary: "Set a person's storage quota (null: the default)", role: 'admin', params: id,
    body: { schema: ChangeQuotaRequest, example: { files: 10_000, bytes: null } },
    response: { status: 200, description: 'Quota', ...json('StorageQuotaView', 'shared/storage-quota.ts') },
  },
  { method: 'get', path: '/api/dev/mailbox', tag: 'admin', summary: 'The local mailbox of `npm start` (development mode only)', role: 'admin', response: { status: 200, description: 'Messages', ...json('mailbox listing', 'api/src/dev/fake-smtp') } },

  // Instance library
  {
    method: 'get', path: '/api/instance-sets', tag: 'instance library', summary: 'Instance sets you may see, searched and paged', role: 'visitor',
    query: InstanceSetListQuery, queryExample: { q: 'depot', page: 1, pageSize: 20 },
    response: { status: 200, description: 'A page of sets', ...json('InstanceSetListResponse', 'shared/instance-sets.ts') },
  },
  {
    method: 'post', path: '/api/instance-sets', tag: 'instance library', summary: 'Create an instance set', role: 'researcher',
    body: { schema: CreateInstanceSetRequest, example: { name: 'Kestrel Row night shift', visibility: 'private', description: 'Parcel depot, 40 robots.', source: 'Own drawings, CC BY 4.0' } },
    response: { status: 201, description: 'The new set', ...json('InstanceSetDetail', 'shared/instance-sets.ts') },
  },
  {
    method: 'post', path: '/api/instance-sets/generate', tag: 'instance library', summary: 'Generate a map and scenarios into a set you manage', role: 'researcher',
    body: { schema: GenerateInstancesRequest, example: { instanceSetId: 3, map: { kind: 'warehouse', shelfColumns: 4, shelfRows: 3, shelfLength: 6 }, scenarioCount: 2, seed: 11 } },
    response: { status: 201, description: 'What was stored', ...json('GenerateInstancesResponse', 'shared/instance-sets.ts') },
  },
  { method: 'get', path: '/api/instance-sets/{id}', tag: 'instance library', summary: 'One set with its maps and scenarios', role: 'visitor', params: id, response: { status: 200, description: 'The set', ...json('InstanceSetDetail', 'shared/instance-sets.ts') } },
  {
    method: 'patch', path: '/api/instance-sets/{id}', tag: 'instance library', summary: 'Change name, description, visibility or source', role: 'researcher', params: id,
    body: { schema: UpdateInstanceSetRequest, example: { visibility: 'public' } },
    response: { status: 200, description: 'The set', ...json('InstanceSetDetail', 'shared/instance-sets.ts') },
  },
  { method: 'delete', path: '/api/instance-sets/{id}', tag: 'instance library', summary: 'Delete a set with its files and results', role: 'researcher', params: id, response: { status: 204, description: 'Deleted' } },
  { method: 'get', path: '/api/instance-sets/{id}/archive', tag: 'instance library', summary: "The set's maps and scenarios as uploaded, in one zip with README.txt and SHA256SUMS", role: 'visitor', params: id, response: { status: 200, description: 'The archive', body: file('application/zip', 'maps/ and scenarios/ under a folder named after the set') } },
  { method: 'get', path: '/api/instance-sets/{id}/deletion-preview', tag: 'instance library', summary: 'What deleting the set would remove', role: 'researcher', params: id, response: { status: 200, description: 'Counts', ...json('DeletionPreview', 'shared/instance-sets.ts') } },
  {
    method: 'post', path: '/api/instance-sets/{id}/files', tag: 'instance library', summary: 'Upload map and scenario files (or a zip of them)', role: 'researcher', params: id,
    body: { schema: z.object({ files: z.array(z.string().meta({ format: 'binary' })) }), contentType: 'multipart/form-data' },
    response: { status: 201, description: 'What was stored', ...json('UploadResponse', 'shared/instance-sets.ts') },
  },
  ...(['maps', 'scenarios'] as const).flatMap((kind): ApiRoute[] => {
    const one = kind === 'maps' ? 'map' : 'scenario';
    return [
      { method: 'get', path: `/api/${kind}/{id}`, tag: 'instance library', summary: `One ${one} with its figures`, role: 'visitor', params: id, response: { status: 200, description: `The ${one}`, ...json(kind === 'maps' ? 'MapDetail' : 'ScenarioDetail', 'shared/instance-sets.ts') } },
      { method: 'get', path: `/api/${kind}/{id}/download`, tag: 'instance library', summary: `The ${one} file as uploaded`, role: 'visitor', params: id, response: { status: 200, description: 'The file', body: file('text/plain', `The .${kind === 'maps' ? 'map' : 'scen'} file`) } },
      { method: 'get', path: `/api/${kind}/{id}/deletion-preview`, tag: 'instance library', summary: `What deleting the ${one} would remove`, role: 'researcher', params: id, response: { status: 200, description: 'Counts', ...json('DeletionPreview', 'shared/instance-sets.ts') } },
      { method: 'delete', path: `/api/${kind}/{id}`, tag: 'instance library', summary: `Delete the ${one} and its results`, role: 'researcher', params: id, response: { status: 204, description: 'Deleted' } },
    ];
  }),

  // Sweeps
  { method: 'get', path: '/api/sweeps', tag: 'sweeps', summary: 'Your sweeps (every sweep for maintainers)', role: 'researcher', response: { status: 200, description: 'Sweeps', ...json('SweepListResponse', 'shared/runs.ts') } },
  {
    method: 'post', path: '/api/sweeps/preview', tag: 'sweeps', summary: 'How many runs a definition would make', role: 'researcher',
    body: { schema: SweepDefinitionSchema, example: SWEEP_EXAMPLE },
    response: { status: 200, description: 'Size', ...json('SweepPreview', 'shared/runs.ts') },
  },
  {
    method: 'post', path: '/api/sweeps', tag: 'sweeps', summary: 'Launch a sweep', role: 'maintainer',
    body: { schema: SweepDefinitionSchema, example: SWEEP_EXAMPLE },
    response: { status: 201, description: 'The sweep', ...json('SweepDetail', 'shared/runs.ts') },
  },
  { method: 'get', path: '/api/sweeps/{id}', tag: 'sweeps', summary: 'One sweep with its progress', role: 'researcher', params: id, response: { status: 200, description: 'The sweep', ...json('SweepDetail', 'shared/runs.ts') } },
  { method: 'get', path: '/api/sweeps/{id}/results', tag: 'sweeps', summary: "A sweep's runs and results", role: 'researcher', params: id, response: { status: 200, description: 'Runs', ...json('SweepResultsResponse', 'shared/runs.ts') } },
  { method: 'post', path: '/api/sweeps/{id}/cancel', tag: 'sweeps', summary: 'Cancel a sweep (owner, maintainers)', role: 'researcher', params: id, response: { status: 200, description: 'The sweep', ...json('SweepDetail', 'shared/runs.ts') } },
  { method: 'get', path: '/api/sweeps/{id}/results.csv', tag: 'sweeps', summary: 'One CSV row per run with its parameters and figures, with provenance lines', role: 'researcher', params: id, response: { status: 200, description: 'CSV', body: file('text/csv', 'RFC 4180, # comment lines first') } },
  { method: 'get', path: '/api/sweeps/{id}/plans.zip', tag: 'sweeps', summary: 'Every stored plan of the sweep as plan JSON documents, with manifest.csv', role: 'researcher', params: id, response: { status: 200, description: 'The archive', body: file('application/zip', 'One plan document per solved run (see /api/schemas/plan-format.schema.json)') } },
  { method: 'get', path: '/api/sweeps/{id}/events', tag: 'sweeps', summary: 'Live progress as server-sent events', role: 'researcher', params: id, response: { status: 200, description: 'Event stream', body: file('text/event-stream', 'snapshot, result and end events') } },

  // External solvers (issue 16, item 4): writes are for a maintainer's browser session (no token scope opens them).
  { method: 'get', path: '/api/external-solvers', tag: 'external solvers', summary: 'Registered external solvers and the workers that have them', role: 'researcher', response: { status: 200, description: 'Solvers', ...json('ExternalSolverListResponse', 'shared/external-solvers.ts') } },
  {
    method: 'post', path: '/api/external-solvers', tag: 'external solvers', summary: 'Register an external solver (name, version, plan models, command template)', role: 'maintainer', isSessionOnly: true,
    body: { schema: ExternalSolverRequestSchema, example: EXTERNAL_SOLVER_EXAMPLE },
    response: { status: 201, description: 'The registration', ...json('ExternalSolverView', 'shared/external-solvers.ts') },
  },
  { method: 'delete', path: '/api/external-solvers/{id}', tag: 'external solvers', summary: 'Remove a registration (refused while live sweeps wait for it)', role: 'maintainer', isSessionOnly: true, params: id, response: { status: 204, description: 'Removed' } },

  // Executions and plans
  {
    method: 'post', path: '/api/executions', tag: 'executions', summary: 'Simulate a plan on the robot fleet (a stored result, or an instance with or without a plan)', role: 'researcher',
    body: { schema: z.union([ResultExecutionRequestSchema, InstanceExecutionRequestSchema]), example: { resultId: 42, policy: 'dependency-gated', runs: 10, noise: { stallProbability: 0.05, stallMs: 500 } } },
    response: { status: 201, description: 'The execution', ...json('ExecutionView', 'shared/executions.ts') },
  },
  { method: 'get', path: '/api/executions/{id}', tag: 'executions', summary: 'One of your executions', role: 'researcher', params: id, response: { status: 200, description: 'The execution', ...json('ExecutionView', 'shared/executions.ts') } },
  { method: 'get', path: '/api/executions/stored/{resultId}', tag: 'executions', summary: 'The replays a sweep stored with a result', role: 'visitor', params: resultId, response: { status: 200, description: 'Replays', ...json('StoredResultExecutionsView', 'shared/stored-executions.ts') } },
  { method: 'get', path: '/api/executions/results/{resultId}', tag: 'executions', summary: "A stored result's plan and instance, to draw and replay", role: 'visitor', params: resultId, response: { status: 200, description: 'The plan view', ...json('ResultPlanView', 'shared/result-plan-view.ts') } },
  ...PLAN_DOWNLOAD_FORMATS.map((format): ApiRoute => ({
    method: 'get', path: `/api/executions/results/{resultId}/plan.${format}`, tag: 'executions', summary: `A stored result's plan as a ${format === 'json' ? 'JSON plan document' : 'text plan'} file`, role: 'visitor', params: resultId,
    response: { status: 200, description: 'The plan file', body: file(format === 'json' ? 'application/json' : 'text/plain', 'See /api/schemas/plan-format.schema.json') },
  })),

  // Field trials
  { method: 'get', path: '/api/trials/results/{resultId}', tag: 'field trials', summary: "A result's field trial runs beside the simulation they are compared with", role: 'visitor', params: resultId, response: { status: 200, description: 'Trials', ...json('FieldTrialsView', 'shared/field-trials.ts') } },
  {
    method: 'post', path: '/api/trials/results/{resultId}', tag: 'field trials', summary: 'Attach field trial logs (CSV, JSON or a zip of them) to a result', role: 'researcher', params: resultId,
    body: {
      schema: z.object({ files: z.array(z.string().meta({ format: 'binary' })), policy: TrialUploadFields.shape.policy, notes: z.string().optional().meta({ description: 'Free text: floor, robot type, date.' }) }),
      contentType: 'multipart/form-data',
    },
    response: { status: 201, description: 'The stored upload', ...json('FieldTrialsView', 'shared/field-trials.ts') },
  },
  {
    method: 'post', path: '/api/trials/results/{resultId}/calibration', tag: 'field trials', summary: "Fit a robot profile to a result's field runs", role: 'researcher', params: resultId,
    body: { schema: CalibrationRequest, example: { runIds: [3, 4, 5] } },
    response: { status: 200, description: 'The fit, the profile it gives and its provenance', ...json('TrialCalibrationView', 'shared/field-trials.ts') },
  },
  { method: 'get', path: '/api/robot-profiles', tag: 'field trials', summary: 'Named robot profiles (yours; every one for maintainers and admins)', role: 'researcher', response: { status: 200, description: 'Profiles', ...json('NamedRobotProfile[]', 'shared/field-trials.ts') } },
  {
    method: 'post', path: '/api/robot-profiles', tag: 'field trials', summary: 'Save a profile fitted from field runs under a name', role: 'researcher',
    body: { schema: SaveRobotProfileRequest, example: { name: 'Floor B two-wheel robots', resultId: 42, runIds: [3, 4, 5] } },
    response: { status: 201, description: 'The saved profile', ...json('NamedRobotProfile', 'shared/field-trials.ts') },
  },
  { method: 'delete', path: '/api/trials/uploads/{id}', tag: 'field trials', summary: 'Delete an upload of field trial runs', role: 'researcher', params: id, response: { status: 204, description: 'Deleted' } },

  // Boards, exports, submissions, reports
  {
    method: 'get', path: '/api/history', tag: 'leaderboards', summary: 'Every result and submission stored for one board row (instance × model variant × robot profile), newest first', role: 'visitor',
    query: HistoryQuery, queryExample: { scenarioId: 12, agents: 8, model: 'k-robust', variant: 'k=1', profile: '3f9a0c1d2e4b5a69', limit: 20 },
    response: { status: 200, description: 'The history', ...json('InstanceHistory', 'shared/history.ts') },
  },
  { method: 'get', path: '/api/leaderboards/rows', tag: 'leaderboards', summary: 'A window of rows of a board view', role: 'visitor', query: BoardViewQuery, queryExample: { cols: 'model,socSteps,runtimeMs', sort: '-socSteps', start: 0, end: 50, 'source.in': 'submitted' }, response: { status: 200, description: 'Rows', ...json('LeaderboardPage', 'shared/leaderboards.ts') } },
  {
    method: 'get', path: '/api/leaderboards/summary', tag: 'leaderboards', summary: 'The per-model summary', role: 'visitor',
    query: z.object({ ...boardScope, bestAmong: z.enum(BEST_AMONG).optional() }), queryExample: { bestAmong: 'all' },
    response: { status: 200, description: 'Summary', ...json('ModelSummaryResponse', 'shared/leaderboards.ts') },
  },
  {
    method: 'get', path: '/api/leaderboards/charts', tag: 'leaderboards', summary: 'Chart data of a policy', role: 'visitor',
    query: z.object({ ...boardScope, policy: z.enum(LEADERBOARD_POLICIES.map((p) => p.policy) as [string, ...string[]]).optional() }), queryExample: { policy: 'open-loop' },
    response: { status: 200, description: 'Series', ...json('LeaderboardCharts', 'shared/leaderboards.ts') },
  },
  {
    method: 'get', path: '/api/exports', tag: 'leaderboards', summary: 'A board view as a CSV, LaTeX, Markdown or JSON file with provenance', role: 'visitor',
    query: BoardViewQuery.extend({
      format: z.enum(EXPORT_FORMATS),
      latexColumns: z.enum(['shown']).optional().describe('LaTeX of the default entries columns is a 12-column paper table; "shown" exports every column of the view instead'),
    }), queryExample: { format: 'csv', cols: 'model,socSteps' },
    response: { status: 200, description: 'The file (content type by format)', body: file('text/csv', 'The exported table') },
  },
  {
    method: 'post', path: '/api/submissions', tag: 'submissions', summary: 'Submit a plan from your own solver', role: 'researcher',
    body: {
      schema: SubmissionRequestSchema,
      example: { format: 'text', text: '(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n', model: 'classic', instance: { scenarioId: 12, agents: 2 }, solver: { name: 'My planner', version: '0.3' } },
    },
    response: { status: 201, description: 'The accepted submission with its figures', ...json('SubmissionView', 'shared/submissions.ts') },
  },
  { method: 'get', path: '/api/submissions', tag: 'submissions', summary: 'Your accepted submissions', role: 'researcher', response: { status: 200, description: 'Submissions', ...json('SubmissionListResponse', 'shared/submissions.ts') } },
  {
    method: 'post', path: '/api/submissions/batches', tag: 'submissions',
    summary: 'Submit a batch of plans: a zip with batch.json and the plan files (multipart field `archive`), or the manifest as JSON with each plan\'s text; answers 202 and checks the plans in the background', role: 'researcher',
    body: { schema: z.union([BatchManifestSchema, BatchManifestSchema.shape.plans]), example: BATCH_EXAMPLE },
    alsoAccepts: { schema: z.object({ [BATCH_UPLOAD_FIELD]: z.string().meta({ format: 'binary', description: 'The batch zip: batch.json and the plan files it names.' }) }), contentType: 'multipart/form-data' },
    response: { status: 202, description: 'The batch, stored and being checked (Location: its URL)', ...json('SubmissionBatchSummary', 'shared/submission-batches.ts') },
  },
  { method: 'get', path: '/api/submissions/batches', tag: 'submissions', summary: 'Your batches, newest first', role: 'researcher', response: { status: 200, description: 'Batches', ...json('SubmissionBatchListResponse', 'shared/submission-batches.ts') } },
  {
    method: 'get', path: '/api/submissions/batches/{id}', tag: 'submissions', summary: 'One of your batches: progress and each plan\'s outcome (figures or the first violation)', role: 'researcher', params: id,
    response: { status: 200, description: 'The batch', ...json('SubmissionBatchView', 'shared/submission-batches.ts') },
  },
  {
    method: 'get', path: '/api/submissions/profiles', tag: 'submissions', summary: 'The robot profiles to score a plan for an instance under', role: 'researcher',
    query: ProfilesQuery, queryExample: { scenarioId: '12', agents: '2' },
    response: { status: 200, description: 'Profiles', ...json('SubmissionProfilesResponse', 'shared/submissions.ts') },
  },
  { method: 'get', path: '/api/reports/choices', tag: 'reports', summary: 'Sets and robot profiles with results, and the policies', role: 'visitor', response: { status: 200, description: 'Choices', ...json('ReportChoices', 'shared/reports.ts') } },
  {
    method: 'get', path: '/api/reports/model-comparison', tag: 'reports', summary: 'The model comparison report as JSON, Markdown or LaTeX', role: 'visitor',
    query: z.object({
      set: z.string().regex(/^[1-9]\d{0,8}$/).meta({ description: 'Instance set id.' }),
      profile: z.string().regex(/^[0-9a-f]{16}$/).optional(),
      policy: z.enum(REPORT_POLICIES as [string, ...string[]]).optional(),
      format: z.enum(REPORT_FORMATS).optional(),
    }).strict(),
    queryExample: { set: '3', policy: 'dependency-gated', format: 'markdown' },
    response: { status: 200, description: 'The report', ...json('ModelComparisonReport', 'shared/reports.ts') },
  },
];
