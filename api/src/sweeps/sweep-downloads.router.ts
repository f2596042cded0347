/**
 * A sweep's bulk downloads (issue 16, item 6), seen by whoever may see the sweep (sweep-access.ts;
 * others get 404 SWEEP_NOT_FOUND like the sweep page):
 * - GET /api/sweeps/:id/results.csv: one row per run with its parameters, figures and the
 *   execution figures per policy, written by the export CSV writer with the provenance lines;
 * - GET /api/sweeps/:id/plans.zip: every stored plan of the sweep as a plan JSON document (the
 *   format a plan is submitted in, shared/plan-format.ts), one file per solved run, named by
 *   scenario, agents, model and seed, plus manifest.csv listing each file with its figures and
 *   SHA-256. Written while sent: plans are read from the database a batch at a time.
 */
import { createHash } from 'node:crypto';
import { Router } from 'express';
import { Op, QueryTypes } from 'sequelize';
import { toCsv } from '@shared/exports-csv';
import { SAFETY_NOTE } from '@shared/executions-constants';
import type { ExportCell } from '@shared/exports-table';
import { ENTRY_COLUMNS, LEADERBOARD_POLICIES, profileLabel, type LeaderboardColumn } from '@shared/leaderboards';
import type { SweepResultRow } from '@shared/runs';
import type { SweepDefinition } from '@shared/sweeps';
import type { AppContext } from '../app-context';
import { requireRole, requireUser } from '../auth/require-role';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { planDocument } from '../executions/plan-document';
import { storedResultPlan } from '../executions/result-plan';
import { createProvenanceReader } from '../exports/export-provenance';
import { SWEEP_SOLVER_NAME } from '../history/history.service';
import { attachmentDisposition } from '../http/content-disposition';
import { sendZip } from '../http/zip-download';
import { archiveName } from '../instance-sets/instance-set-archive';
import { IdParam } from '../instance-sets/instance-sets.router';
import { loadInstance, type LoadedInstance } from '../instance-sets/load-instance';
import type { Result } from './result.model';
import { canSeeSweep } from './sweep-access';
import { modelLabel, readResultRows } from './sweep-progress';

/** Plans read from the database per query while the archive is written. */
const PLAN_BATCH = 50;

/** A column of the CSV: the board's column of the same id where there is one (same label and unit), else its own. */
const entryColumn = (id: string): LeaderboardColumn => ENTRY_COLUMNS.find((c) => c.id === id) as LeaderboardColumn;
const text = (id: string, label: string): LeaderboardColumn => ({ id, label, kind: 'text' });
const number = (id: string, label: string, unit?: string): LeaderboardColumn => ({ id, label, kind: 'number', ...(unit ? { unit } : {}) });

/** Per policy of the sweep: the columns of its execution figures and how a row fills them. */
function policyColumns(policy: string): { columns: LeaderboardColumn[]; cells: (r: SweepResultRow) => ExportCell[] } {
  const label = LEADERBOARD_POLICIES.find((p) => p.policy === policy)?.label ?? policy;
  return {
    columns: [
      number(`runs:${policy}`, `Simulated runs, ${label}`),
      number(`success:${policy}`, `Execution success rate, ${label}`),
      number(`collisions:${policy}`, `Collisions per run (mean), ${label}`),
      number(`realised:${policy}`, `Realised makespan (mean), ${label}`, 'ms'),
      number(`realisedP95:${policy}`, `Realised makespan (95th percentile), ${label}`, 'ms'),
      number(`spread:${policy}`, `Finish spread (mean), ${label}`, 'ms'),
    ],
    cells: (r) => {
      const e = r.executions.find((x) => x.policy === policy);
      return e ? [e.runs, e.successRate, e.collisionsMean, e.realisedMakespanMeanMs, e.realisedMakespanP95Ms, e.finishSpreadMeanMs] : [null, null, null, null, null, null];
    },
  };
}

/** The CSV table of a sweep's rows (one per run; a run still pending or running has no figures yet). */
export function sweepResultsTable(sweepId: number, sweepName: string, def: SweepDefinition, rows: readonly SweepResultRow[]) {
  const policies = def.execution.policies.map(policyColumns);
  const isMeasured = rows.some((r) => (r.cpuTimeMs ?? null) !== null || (r.peakMemoryKb ?? null) !== null);
  const columns: LeaderboardColumn[] = [
    number('run', 'Run'), number('result', 'Result'), entryColumn('map'), entryColumn('scenario'), entryColumn('agents'), entryColumn('model'),
    text('parameters', 'Model parameters'), entryColumn('suboptimality'), number('seed', 'Seed'), text('status', 'Status'), text('reason', 'Reason'),
    ...['socSteps', 'socMs', 'makespanSteps', 'makespanMs', 'tiSocMs', 'tiMakespanMs', 'lowerBoundSteps', 'lowerBoundMs', 'gap', 'runtimeMs'].map(entryColumn),
    number('nodes', 'Search nodes'),
    // External solvers' runs are measured by the worker (issue 16, item 4); the columns show when a run has them.
    ...(isMeasured ? [number('cpuTime', 'CPU time of the solver and the processes it waited for', 'ms'), number('peakMemory', 'Peak resident memory of the largest single solver process', 'kB')] : []),
    ...policies.flatMap((p) => p.columns),
  ];
  const inMs = (r: SweepResultRow) => r.model === 'weighted-split';
  const split = (r: SweepResultRow, v: number | null): [ExportCell, ExportCell] => (inMs(r) ? [null, v] : [v, null]);
  const tableRows = rows.map((r): ExportCell[] => {
    const spec = def.models[r.modelIndex];
    return [
      r.runId, r.resultId, r.mapName, r.scenarioName, r.agents, r.model, spec ? modelLabel(spec) : r.model, r.suboptimality, r.seed, r.status, r.reason,
      ...split(r, r.soc), ...split(r, r.makespan), r.turnInclusiveSocMs, r.turnInclusiveMakespanMs, ...split(r, r.lowerBound), r.gap, r.runtimeMs,
      r.nodes,
      ...(isMeasured ? [r.cpuTimeMs ?? null, r.peakMemoryKb ?? null] : []),
      ...policies.flatMap((p) => p.cells(r)),
    ];
  });
  return {
    caption: `Sweep ${sweepId} "${sweepName}": one row per run (${rows.length}), with its model parameters, seed and status; sum-of-costs, makespan and lower bound in steps `
      + `(classic, uniform-duration, orientation-split, k-robust) or ms (weighted-split), each unit in its own column. Robot profile: ${profileLabel(def.robotProfile)}.`,
    columns, rows: tableRows, compareColumns: [],
    ...(policies.length > 0 ? { caution: SAFETY_NOTE } : {}),
  };
}

/** A piece of a file name: letters, digits, `.`, `=` and `-` kept, runs of anything else as one `-`. */
function slug(textValue: string): string {
  return textValue.replace(/[^\p{L}\p{N}.=]+/gu, '-').replace(/^-+|-+$/g, '') || 'x';
}

/** The sweep-download routes, mounted under /sweeps. */
export function sweepDownloadsRouter(ctx: AppContext): Router {
  const models: Models = ctx.models;
  const provenanceOf = createProvenanceReader(ctx.sequelize);
  const r = Router();

  async function visibleSweep(viewer: Express.User, id: number) {
    const sweep = await models.Sweep.findByPk(id);
    const set = sweep && (await models.InstanceSet.findByPk(sweep.definition.instances.instanceSetId, { attributes: ['id', 'ownerId', 'visibility'] }));
    if (!sweep || !canSeeSweep(sweep, set ?? null, viewer)) throw new AppError('SWEEP_NOT_FOUND', 404, `No sweep ${id}`);
    return sweep;
  }

  r.get('/:id/results.csv', requireRole('researcher'), async (req, res) => {
    const { id } = validate(IdParam, req.params);
    const sweep = await visibleSweep(requireUser(req), id);
    const rows = await readResultRows(ctx.sequelize, id);
    const provenance = await provenanceOf({ resultIds: rows.flatMap((x) => (x.resultId === null ? [] : [x.resultId])), entries: [] });
    res.setHeader('content-type', 'text/csv; charset=utf-8');
    res.setHeader('content-disposition', attachmentDisposition(`quarterturn-sweep-${id}-results.csv`));
    res.send(toCsv({ ...sweepResultsTable(id, sweep.name, sweep.definition, rows), provenance }));
  });

  r.get('/:id/plans.zip', requireRole('researcher'), async (req, res) => {
    const { id } = validate(IdParam, req.params);
    const sweep = await visibleSweep(requireUser(req), id);
    const def = sweep.definition;
    // Everything but the plans themselves, which are read a batch at a time as the archive reaches them.
    const results: Result[] = await models.Result.findAll({
      where: { sweepId: id, status: 'solved', planGz: { [Op.ne]: null } },
      attributes: { exclude: ['planGz'] }, order: [['id', 'ASC']],
    });
    const [runs, scenarios, maps] = await Promise.all([
      ctx.sequelize.query<{ id: number; model_index: number }>('SELECT id, model_index FROM runs WHERE sweep_id = :id', { replacements: { id }, type: QueryTypes.SELECT }),
      models.ScenarioFile.findAll({ where: { id: [...new Set(results.map((x) => x.scenarioId))] }, attributes: ['id', 'name', 'mapId'] }),
      models.MapFile.findAll({ where: { id: [...new Set(results.map((x) => x.mapId))] }, attributes: ['id', 'name'] }),
    ]);
    const modelIndexOf = new Map(runs.map((x) => [x.id, x.model_index]));
    const scenarioName = new Map(scenarios.map((s) => [s.id, s.name]));
    const mapName = new Map(maps.map((m) => [m.id, m.name]));
    const specOf = (x: Result) => (x.runId === null ? undefined : def.models[modelIndexOf.get(x.runId) ?? -1]);
    const labelOf = (x: Result) => {
      const spec = specOf(x);
      return spec ? modelLabel(spec) : x.model;
    };
    // An external solver's result carries that solver's version in solver_version (migration 0411).
    const authorOf = (x: Result) => ({ name: specOf(x)?.externalSolver?.name ?? SWEEP_SOLVER_NAME, version: x.solverVersion });
    const pathOf = (x: Result) =>
      `${archiveName(scenarioName.get(x.scenarioId) ?? `scenario-${x.scenarioId}`)}/${x.agents}-agents/${slug(labelOf(x))}-seed-${x.seed}-result-${x.id}.json`;

    // Instances are loaded once per scenario, with the most agents any result of it has.
    const mostAgents = new Map<number, number>();
    for (const x of results) mostAgents.set(x.scenarioId, Math.max(x.agents, mostAgents.get(x.scenarioId) ?? 0));
    const instances = new Map<number, Promise<LoadedInstance>>();
    const instanceOf = async (x: Result): Promise<LoadedInstance> => {
      let loading = instances.get(x.scenarioId);
      if (!loading) {
        loading = loadInstance(models, x.scenarioId, mostAgents.get(x.scenarioId) ?? x.agents);
        instances.set(x.scenarioId, loading);
      }
      const all = await loading;
      return { ...all, instance: { ...all.instance, agents: all.instance.agents.slice(0, x.agents) } };
    };
    const batch = new Map<number, Buffer>();
    const planOf = async (i: number): Promise<Buffer> => {
      if (!batch.has(results[i].id)) {
        batch.clear();
        const ids = results.slice(i, i + PLAN_BATCH).map((x) => x.id);
        for (const row of await models.Result.findAll({ where: { id: ids }, attributes: ['id', 'planGz'] })) if (row.planGz) batch.set(row.id, row.planGz);
      }
      const gz = batch.get(results[i].id);
      if (!gz) throw new Error(`result ${results[i].id} lost its plan during the download`);
      return gz;
    };

    const folder = `sweep-${id}-plans`;
    const manifest: ExportCell[][] = [];
    await sendZip(res, `quarterturn-sweep-${id}-plans.zip`, (zip) => {
      results.forEach((x, i) => {
        const path = pathOf(x);
        zip.addLazy(`${folder}/${path}`, async () => {
          const doc = planDocument(storedResultPlan(x, await planOf(i), await instanceOf(x)), authorOf(x));
          const bytes = Buffer.from(JSON.stringify(doc, null, 1) + '\n', 'utf8');
          manifest.push([path, x.id, x.runId, mapName.get(x.mapId) ?? '', scenarioName.get(x.scenarioId) ?? '', x.agents, x.model, labelOf(x), Number(x.seed),
            x.soc, x.makespan, x.turnInclusiveSocMs, x.turnInclusiveMakespanMs, x.lowerBound, x.runtimeMs, createHash('sha256').update(bytes).digest('hex')]);
          return bytes;
        }, x.createdAt);
      });
      // Last entry: by the time the archive reaches it every plan above was written and hashed.
      zip.addLazy(`${folder}/manifest.csv`, async () => Buffer.from(toCsv({
        caption: `Plans of sweep ${id} "${sweep.name}": one plan document (format quarterturn-plan, version 1) per solved run; `
          + `sum-of-costs, makespan and lower bound in the model's unit (steps; ms for weighted-split). Robot profile: ${profileLabel(def.robotProfile)}.`,
        columns: [
          text('file', 'File'), number('result', 'Result'), number('run', 'Run'), entryColumn('map'), entryColumn('scenario'), entryColumn('agents'),
          entryColumn('model'), text('parameters', 'Model parameters'), number('seed', 'Seed'), number('soc', 'Sum-of-costs'), number('makespan', 'Makespan'),
          entryColumn('tiSocMs'), entryColumn('tiMakespanMs'), number('lowerBound', 'Lower bound'), entryColumn('runtimeMs'), text('sha256', 'SHA-256 of the file'),
        ],
        rows: manifest, compareColumns: [],
        provenance: await provenanceOf({ resultIds: results.map((x) => x.id), entries: [] }),
      }), 'utf8'));
    });
  });

  return r;
}
