/**
 * Rules of the instance library: creating, listing, reading and deleting sets, storing
 * uploaded or generated files (one transaction per upload, nothing stored when any file has a
 * problem or the owner's storage quota would be passed), and reading maps and scenarios back.
 * Visibility follows instance-set-access.ts. Files are opened and checked off the event loop
 * (`prepare`: the app's interactive pool) and stored row by row with bound parameters, so no
 * step of a large upload holds the event loop for long.
 */
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  CreateInstanceSetRequest, GenerateInstancesRequest, INVALID_INSTANCE_FILES, InstanceSetListQuery, UpdateInstanceSetRequest,
  type ConflictDetail, type DeletionPreview, type InstanceSetDetail, type InstanceSetListResponse, type InstanceSetSummary, type MapDetail,
  type MapSummary, type ScenarioDetail, type ScenarioSummary, type UploadProblem, type UploadResponse, type Visibility,
} from '@shared/instance-sets';
import { DEFAULT_STORAGE_QUOTA } from '../config';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import type { ReceivedFile } from './collect-upload';
import { generateEntries, type GenerateRequest } from './generate-entries';
import { canManageSet, isSetVisible, visibleSetsCondition, type Viewer } from './instance-set-access';
import type { InstanceSet } from './instance-set.model';
import {
  MAP_SUMMARY_ATTRIBUTES, SCENARIO_SUMMARY_ATTRIBUTES, toMapSummary, toRowView, toScenarioSummary,
} from './library-views';
import type { MapFile } from './map-file.model';
import {
  asBuffer, prepareUpload, type LoadMaps, type PreparedUpload, type PrepareUploadJob, type UploadFileBytes,
} from './prepare-upload';
import type { ScenarioFile } from './scenario-file.model';
import { createStorageQuotas, quotaAmountsOf, type StorageQuotas } from './storage-quota';
import type { UploadEntry } from './upload-entry';
import { requesterKey } from '../workers/interactive-pool';

/** A file to send back exactly as uploaded. */
export interface StoredFileBytes {
  readonly name: string;
  readonly checksum: string;
  readonly bytes: Buffer;
}

/** The instance library operations behind the routes. */
export interface InstanceSetsService {
  create(owner: Express.User, body: unknown): Promise<InstanceSetDetail>;
  list(viewer: Viewer, query: unknown): Promise<InstanceSetListResponse>;
  get(viewer: Viewer, id: number): Promise<InstanceSetDetail>;
  /** 404 when invisible, 403 when visible but not the viewer's to change. */
  assertCanManage(viewer: Viewer, id: number): Promise<void>;
  remove(viewer: Viewer, id: number): Promise<void>;
  /** Renames a set or changes its description, visibility or source (owner, maintainers, admins). */
  update(viewer: Viewer, id: number, body: unknown): Promise<InstanceSetDetail>;
  /** What deleting a set, map or scenario would take with it (only for those who may delete it). */
  deletionPreview(viewer: Viewer, kind: DeletionPreview['kind'], id: number): Promise<DeletionPreview>;
  /** `signal` cancels the checks (the client went away); nothing is stored then. */
  upload(viewer: Viewer, id: number, files: readonly ReceivedFile[], signal?: AbortSignal): Promise<UploadResponse>;
  generate(viewer: Viewer, body: unknown): Promise<UploadResponse>;
  getMap(viewer: Viewer, id: number): Promise<MapDetail>;
  mapBytes(viewer: Viewer, id: number): Promise<StoredFileBytes>;
  removeMap(viewer: Viewer, id: number): Promise<void>;
  getScenario(viewer: Viewer, id: number): Promise<ScenarioDetail>;
  scenarioBytes(viewer: Viewer, id: number): Promise<StoredFileBytes>;
  removeScenario(viewer: Viewer, id: number): Promise<void>;
  /** Home-page counts of what `viewer` may see. */
  count(viewer: Viewer, what: 'instanceSets' | 'maps' | 'scenarios'): Promise<number>;
}

interface ListRow {
  id: number;
  name: string;
  description: string;
  visibility: Visibility;
  source: string;
  created_at: Date;
  updated_at: Date;
  owner_id: number;
  owner_login: string;
  owner_display_name: string;
  map_count: number;
  scenario_count: number;
}

const SUMMARY_SELECT = `
  SELECT s.id, s.name, s.description, s.visibility, s.source, s.created_at, s.updated_at,
         u.id AS owner_id, u.login AS owner_login, u.display_name AS owner_display_name,
         (SELECT count(*) FROM maps m WHERE m.instance_set_id = s.id)::int AS map_count,
         (SELECT count(*) FROM scenarios c WHERE c.instance_set_id = s.id)::int AS scenario_count
  FROM instance_sets s JOIN users u ON u.id = s.owner_id`;

function toSummary(r: ListRow): InstanceSetSummary {
  return {
    id: r.id, name: r.name, description: r.description, visibility: r.visibility, source: r.source,
    owner: { id: r.owner_id, login: r.owner_login, displayName: r.owner_display_name },
    mapCount: r.map_count, scenarioCount: r.scenario_count,
    createdAt: new Date(r.created_at).toISOString(), updatedAt: new Date(r.updated_at).toISOString(),
  };
}

/** 409 for a set name its owner already uses, naming the field like a validation answer does. */
function nameTaken(name: string, isViewerOwner: boolean): AppError {
  const message = isViewerOwner
    ? `You already have an instance set named "${name}"; choose another name.`
    : `The owner of this set already has an instance set named "${name}"; choose another name.`;
  const details: ConflictDetail[] = [{ path: ['name'], code: 'taken', message }];
  return new AppError('CONFLICT', 409, message, details);
}

/** Whether `err` is PostgreSQL refusing a duplicate of instance_sets_owner_name (two renames racing past the check). */
function isDuplicateSetName(err: unknown): boolean {
  const e = err as { name?: string; parent?: { constraint?: string } } | null;
  return e?.name === 'SequelizeUniqueConstraintError' && e.parent?.constraint === 'instance_sets_owner_name';
}

/** Counts of what a map's or scenario's deletion cascades to; `:ids` are the scenarios that go. */
const PREVIEW_SQL = `SELECT
    (SELECT count(*) FROM runs WHERE scenario_id IN (:ids))::int AS runs,
    (SELECT count(*) FROM results WHERE scenario_id IN (:ids))::int AS results,
    (SELECT count(*) FROM results WHERE scenario_id IN (:ids) AND submission_id IS NOT NULL)::int AS submissions,
    (SELECT count(DISTINCT sweep_id) FROM runs WHERE scenario_id IN (:ids))::int AS sweeps`;

/** ILIKE pattern matching `text` anywhere, with the wildcard characters escaped. */
function containsPattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** A one-sentence summary of upload problems for the error message. */
function problemsMessage(problems: readonly UploadProblem[]): string {
  const files = new Set(problems.map((p) => p.file));
  const first = problems[0];
  const where = first.line > 0 ? `${first.file}:${first.line}:${first.column}` : first.file;
  return `Nothing was stored: ${problems.length} problem${problems.length === 1 ? '' : 's'} in ${files.size} file${files.size === 1 ? '' : 's'} (first: ${where}: ${first.message}).`;
}

/**
 * What the service needs. `generate` runs the generators and `prepare` opens and checks files (the app passes
 * its interactive pool for both; the demo seed runs them in its own process); `quotas` default to the server's
 * default limits.
 */
export interface InstanceSetsServiceDeps {
  readonly sequelize: Sequelize;
  readonly models: Models;
  readonly generate?: (request: GenerateRequest, requester: string) => Promise<UploadEntry[]>;
  readonly prepare?: (job: PrepareUploadJob, loadMaps: LoadMaps, requester: string, signal?: AbortSignal) => Promise<PreparedUpload>;
  readonly quotas?: StorageQuotas;
}

/** Columns of a map summary as INSERT … RETURNING gives them. */
const MAP_RETURNING = `id, instance_set_id AS "instanceSetId", name, width, height, passable_count AS "passableCount",
  checksum, byte_size AS "byteSize"`;

/** Columns of a scenario summary as INSERT … RETURNING gives them. */
const SCENARIO_RETURNING = `id, instance_set_id AS "instanceSetId", map_id AS "mapId", name, row_count AS "rowCount",
  max_agents AS "maxAgents", checksum, byte_size AS "byteSize"`;

// Bytes are bound as Buffers, which pg sends in binary format: no hex or escaped copy of a large file
// is built on the event loop, and the server reads text and JSON straight from the bytes.
const INSERT_MAP = `INSERT INTO maps (instance_set_id, name, type, width, height, passable_count, cells, checksum, byte_size, original)
  VALUES ($1, $2, $3, $4, $5, $6, $7::text, $8, $9, $10::bytea) RETURNING ${MAP_RETURNING}`;
const INSERT_SCENARIO = `INSERT INTO scenarios (instance_set_id, map_id, name, rows, row_count, max_agents, checksum, byte_size, original)
  VALUES ($1, $2, $3, $4::text::jsonb, $5, $6, $7, $8, $9::bytea) RETURNING ${SCENARIO_RETURNING}`;

/** Builds the service over the library's models. */
export function createInstanceSetsService(deps: InstanceSetsServiceDeps): InstanceSetsService {
  const { sequelize } = deps;
  const generate = deps.generate ?? (async (request: GenerateRequest) => generateEntries(request));
  const prepare = deps.prepare ?? ((job: PrepareUploadJob, loadMaps: LoadMaps) => prepareUpload(job, loadMaps));
  const quotas = deps.quotas ?? createStorageQuotas({ sequelize, defaults: DEFAULT_STORAGE_QUOTA });
  const { InstanceSet, MapFile, ScenarioFile } = deps.models;

  async function summaryOf(id: number, transaction?: Transaction): Promise<InstanceSetSummary> {
    const [row] = await sequelize.query<ListRow>(`${SUMMARY_SELECT} WHERE s.id = :id`, { type: QueryTypes.SELECT, replacements: { id }, transaction });
    return toSummary(row);
  }

  async function detailOf(set: InstanceSet, viewer: Viewer): Promise<InstanceSetDetail> {
    const [summary, maps, scenarios] = await Promise.all([
      summaryOf(set.id),
      MapFile.findAll({ where: { instanceSetId: set.id }, attributes: [...MAP_SUMMARY_ATTRIBUTES], order: [['name', 'ASC']] }),
      ScenarioFile.findAll({ where: { instanceSetId: set.id }, attributes: [...SCENARIO_SUMMARY_ATTRIBUTES], order: [['name', 'ASC']] }),
    ]);
    return { ...summary, maps: maps.map(toMapSummary), scenarios: scenarios.map(toScenarioSummary), canManage: canManageSet(set, viewer) };
  }

  async function visibleSet(viewer: Viewer, id: number): Promise<InstanceSet> {
    const set = await InstanceSet.findByPk(id);
    if (!set || !isSetVisible(set, viewer)) throw new AppError('INSTANCE_SET_NOT_FOUND', 404, `No instance set ${id}`);
    return set;
  }

  async function manageableSet(viewer: Viewer, id: number): Promise<InstanceSet> {
    const set = await visibleSet(viewer, id);
    if (!viewer) throw new AppError('UNAUTHENTICATED', 401, 'Sign in to do this.');
    if (!canManageSet(set, viewer)) {
      throw new AppError('FORBIDDEN', 403, `Only the owner of "${set.name}", maintainers and admins may change it.`);
    }
    return set;
  }

  async function visibleMap(viewer: Viewer, id: number, withData: boolean): Promise<MapFile> {
    const map = await MapFile.findByPk(id, withData ? {} : { attributes: [...MAP_SUMMARY_ATTRIBUTES] });
    const set = map && (await InstanceSet.findByPk(map.instanceSetId));
    if (!map || !set || !isSetVisible(set, viewer)) throw new AppError('MAP_NOT_FOUND', 404, `No map ${id}`);
    return map;
  }

  async function visibleScenario(viewer: Viewer, id: number, withData: boolean): Promise<ScenarioFile> {
    const scenario = await ScenarioFile.findByPk(id, withData ? {} : { attributes: [...SCENARIO_SUMMARY_ATTRIBUTES] });
    const set = scenario && (await InstanceSet.findByPk(scenario.instanceSetId));
    if (!scenario || !set || !isSetVisible(set, viewer)) throw new AppError('SCENARIO_NOT_FOUND', 404, `No scenario ${id}`);
    return scenario;
  }

  /**
   * Opens and checks the files against the set (off the event loop), then stores all of them in one
   * transaction, after the owner's quota check in that same transaction.
   */
  async function storeFiles(set: InstanceSet, files: readonly UploadFileBytes[], requester: string, signal?: AbortSignal): Promise<UploadResponse> {
    const [mapRows, scenarioRows] = await Promise.all([
      MapFile.findAll({ where: { instanceSetId: set.id }, attributes: ['name'] }),
      ScenarioFile.findAll({ where: { instanceSetId: set.id }, attributes: ['name'] }),
    ]);
    const loadMaps: LoadMaps = async (names) => {
      const maps = await MapFile.findAll({ where: { instanceSetId: set.id, name: { [Op.in]: [...names] } }, attributes: ['name', 'type', 'cells'] });
      return maps.map((m) => ({ name: m.name, type: m.type, cells: m.cells }));
    };
    const prepared = await prepare({ files, mapNames: mapRows.map((m) => m.name), scenarioNames: scenarioRows.map((c) => c.name) }, loadMaps, requester, signal);
    if (prepared.kind === 'refused') throw new AppError(INVALID_INSTANCE_FILES, 400, problemsMessage(prepared.problems), prepared.problems);

    return sequelize.transaction(async (transaction) => {
      // The set row first (a set deleted meanwhile is a 404, not a foreign-key error), then the owner's account row.
      const [locked] = await sequelize.query<{ owner_id: number }>(
        'SELECT owner_id FROM instance_sets WHERE id = :id FOR UPDATE', { type: QueryTypes.SELECT, replacements: { id: set.id }, transaction });
      if (!locked) throw new AppError('INSTANCE_SET_NOT_FOUND', 404, `No instance set ${set.id}`);
      await quotas.assertRoom(locked.owner_id, quotaAmountsOf(prepared), transaction);

      const uploadedMapNames = new Set(prepared.maps.map((m) => m.name));
      const storedMapNames = [...new Set(prepared.scenarios.map((c) => c.mapName).filter((n) => !uploadedMapNames.has(n)))];
      const referenced = storedMapNames.length === 0 ? [] : await MapFile.findAll({
        where: { instanceSetId: set.id, name: { [Op.in]: storedMapNames } }, attributes: ['id', 'name'], transaction,
      });
      const mapIds = new Map<string, number>(referenced.map((m) => [m.name, m.id]));
      const storedMaps: MapSummary[] = [];
      for (const m of prepared.maps) {
        const [row] = await sequelize.query<MapSummary>(INSERT_MAP, {
          type: QueryTypes.SELECT, transaction,
          bind: [set.id, m.name, m.type, m.width, m.height, m.passableCount, asBuffer(m.cells), m.checksum, m.original.byteLength, asBuffer(m.original)],
        });
        mapIds.set(row.name, row.id);
        storedMaps.push(toMapSummary(row));
      }
      const storedScenarios: ScenarioSummary[] = [];
      for (const c of prepared.scenarios) {
        const mapId = mapIds.get(c.mapName);
        // A stored map the check used was deleted since: the scenario would have nothing to point to.
        if (mapId === undefined) throw new AppError('CONFLICT', 409, `Nothing was stored: map '${c.mapName}' of ${c.name} was deleted meanwhile; upload it again.`);
        const [row] = await sequelize.query<ScenarioSummary>(INSERT_SCENARIO, {
          type: QueryTypes.SELECT, transaction,
          bind: [set.id, mapId, c.name, asBuffer(c.rows), c.rowCount, c.maxAgents, c.checksum, c.original.byteLength, asBuffer(c.original)],
        });
        storedScenarios.push(toScenarioSummary(row));
      }
      set.changed('updatedAt', true);
      await set.save({ transaction });
      return { maps: storedMaps, scenarios: storedScenarios, skipped: prepared.skipped };
    });
  }

  return {
    async create(owner, body) {
      const input = validate(CreateInstanceSetRequest, body);
      const taken = await InstanceSet.count({ where: { ownerId: owner.id, name: input.name } });
      if (taken > 0) throw nameTaken(input.name, true);
      const set = await InstanceSet.create({ ownerId: owner.id, ...input });
      return detailOf(set, owner);
    },

    async list(viewer, query) {
      const { q, page, pageSize } = validate(InstanceSetListQuery, query);
      const visible = visibleSetsCondition(viewer);
      const search = q ? ' AND (s.name ILIKE :pattern OR s.description ILIKE :pattern)' : '';
      const replacements = { ...visible.replacements, pattern: q ? containsPattern(q) : null, limit: pageSize, offset: (page - 1) * pageSize };
      const where = `WHERE ${visible.sql}${search}`;
      const [rows, [{ total }]] = await Promise.all([
        sequelize.query<ListRow>(`${SUMMARY_SELECT} ${where} ORDER BY s.updated_at DESC, s.id DESC LIMIT :limit OFFSET :offset`, { type: QueryTypes.SELECT, replacements }),
        sequelize.query<{ total: number }>(`SELECT count(*)::int AS total FROM instance_sets s ${where}`, { type: QueryTypes.SELECT, replacements }),
      ]);
      return { items: rows.map(toSummary), total, page, pageSize };
    },

    async get(viewer, id) {
      return detailOf(await visibleSet(viewer, id), viewer);
    },

    async assertCanManage(viewer, id) {
      await manageableSet(viewer, id);
    },

    async remove(viewer, id) {
      const set = await manageableSet(viewer, id);
      // Maps and scenarios go with it (ON DELETE CASCADE).
      await set.destroy();
    },

    async update(viewer, id, body) {
      const set = await manageableSet(viewer, id);
      const input = validate(UpdateInstanceSetRequest, body);
      const isViewerOwner = viewer !== null && viewer.id === set.ownerId;
      if (input.name !== undefined && input.name !== set.name) {
        // The unique index is per owner: the set keeps its owner when a maintainer renames it.
        const taken = await InstanceSet.count({ where: { ownerId: set.ownerId, name: input.name, id: { [Op.ne]: set.id } } });
        if (taken > 0) throw nameTaken(input.name, isViewerOwner);
      }
      for (const key of ['name', 'description', 'visibility', 'source'] as const) {
        if (input[key] !== undefined) set.set(key, input[key]);
      }
      try {
        await set.save();
      } catch (err) {
        if (isDuplicateSetName(err)) throw nameTaken(input.name ?? set.name, isViewerOwner);
        throw err;
      }
      return detailOf(set, viewer);
    },

    async deletionPreview(viewer, kind, id) {
      let name: string;
      let maps = 0;
      let scenarioIds: number[];
      if (kind === 'set') {
        const set = await manageableSet(viewer, id);
        name = set.name;
        maps = await MapFile.count({ where: { instanceSetId: id } });
        scenarioIds = (await ScenarioFile.findAll({ where: { instanceSetId: id }, attributes: ['id'] })).map((c) => c.id);
      } else {
        const file = kind === 'map' ? await visibleMap(viewer, id, false) : await visibleScenario(viewer, id, false);
        await manageableSet(viewer, file.instanceSetId);
        name = file.name;
        scenarioIds = kind === 'map' ? (await ScenarioFile.findAll({ where: { mapId: id }, attributes: ['id'] })).map((c) => c.id) : [id];
      }
      const counts = scenarioIds.length === 0
        ? { runs: 0, results: 0, submissions: 0, sweeps: 0 }
        : (await sequelize.query<Pick<DeletionPreview, 'runs' | 'results' | 'submissions' | 'sweeps'>>(PREVIEW_SQL, { type: QueryTypes.SELECT, replacements: { ids: scenarioIds } }))[0];
      return { kind, id, name, maps, scenarios: kind === 'scenario' ? 0 : scenarioIds.length, ...counts };
    },

    async upload(viewer, id, files, signal) {
      const set = await manageableSet(viewer, id);
      return storeFiles(set, files.map((f) => ({ name: f.originalname, bytes: f.buffer })), requesterKey(viewer), signal);
    },

    async generate(viewer, body) {
      const request = validate(GenerateInstancesRequest, body);
      const set = await manageableSet(viewer, request.instanceSetId);
      const entries = await generate(request, requesterKey(viewer));
      return storeFiles(set, entries.map((e) => ({ name: e.name, bytes: e.bytes })), requesterKey(viewer));
    },

    async getMap(viewer, id) {
      const map = await visibleMap(viewer, id, true);
      const scenarios = await ScenarioFile.findAll({ where: { mapId: map.id }, attributes: [...SCENARIO_SUMMARY_ATTRIBUTES], order: [['name', 'ASC']] });
      return { ...toMapSummary(map), type: map.type, rows: map.cells.split('\n'), scenarios: scenarios.map(toScenarioSummary) };
    },

    async mapBytes(viewer, id) {
      const map = await visibleMap(viewer, id, true);
      return { name: map.name, checksum: map.checksum, bytes: map.original };
    },

    async removeMap(viewer, id) {
      const map = await visibleMap(viewer, id, false);
      await manageableSet(viewer, map.instanceSetId);
      await MapFile.destroy({ where: { id: map.id } });
    },

    async getScenario(viewer, id) {
      const scenario = await visibleScenario(viewer, id, true);
      const map = await MapFile.findByPk(scenario.mapId, { attributes: ['name'] });
      const { rows, ...rest } = scenario.get({ plain: true });
      return {
        ...toScenarioSummary(rest as ScenarioFile), mapName: map?.name ?? '', rows: rows.map(toRowView),
      };
    },

    async scenarioBytes(viewer, id) {
      const scenario = await visibleScenario(viewer, id, true);
      return { name: scenario.name, checksum: scenario.checksum, bytes: scenario.original };
    },

    async removeScenario(viewer, id) {
      const scenario = await visibleScenario(viewer, id, false);
      await manageableSet(viewer, scenario.instanceSetId);
      await ScenarioFile.destroy({ where: { id: scenario.id } });
    },

    async count(viewer, what) {
      const visible = visibleSetsCondition(viewer);
      const sql = what === 'instanceSets'
        ? `SELECT count(*)::int AS n FROM instance_sets s WHERE ${visible.sql}`
        : `SELECT count(*)::int AS n FROM ${what === 'maps' ? 'maps' : 'scenarios'} f JOIN instance_sets s ON s.id = f.instance_set_id WHERE ${visible.sql}`;
      const [{ n }] = await sequelize.query<{ n: number }>(sql, { type: QueryTypes.SELECT, replacements: visible.replacements });
      return n;
    },
  };
}
