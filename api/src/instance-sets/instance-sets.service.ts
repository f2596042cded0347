/**
 * Rules of the instance library: creating, listing, reading and deleting sets, storing
 * uploaded or generated files (one transaction per upload, nothing stored when any file has a
 * problem), and reading maps and scenarios back. Visibility follows instance-set-access.ts.
 */
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  CreateInstanceSetRequest, GenerateInstancesRequest, INVALID_INSTANCE_FILES, InstanceSetListQuery,
  type InstanceSetDetail, type InstanceSetListResponse, type InstanceSetSummary, type MapDetail,
  type ScenarioDetail, type UploadProblem, type UploadResponse, type Visibility,
} from '@shared/instance-sets';
import { gridMapFromRows, type GridMap } from '@solvers/io/grid-map';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { checkUpload, scenarioMapNames, type CheckedUpload } from './check-upload';
import { collectUpload, type ReceivedFile } from './collect-upload';
import { generateEntries, type GenerateRequest } from './generate-entries';
import { canManageSet, isSetVisible, visibleSetsCondition, type Viewer } from './instance-set-access';
import type { InstanceSet } from './instance-set.model';
import {
  MAP_SUMMARY_ATTRIBUTES, SCENARIO_SUMMARY_ATTRIBUTES, toMapSummary, toRowView, toScenarioSummary,
} from './library-views';
import type { MapFile } from './map-file.model';
import type { ScenarioFile, StoredScenarioRow } from './scenario-file.model';
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
  upload(viewer: Viewer, id: number, files: readonly ReceivedFile[]): Promise<UploadResponse>;
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

/** What the service needs; `generate` runs the generators (the app passes its interactive pool; the demo seed runs them in its own process). */
export interface InstanceSetsServiceDeps {
  readonly sequelize: Sequelize;
  readonly models: Models;
  readonly generate?: (request: GenerateRequest, requester: string) => Promise<UploadEntry[]>;
}

/** Builds the service over the library's models. */
export function createInstanceSetsService(deps: InstanceSetsServiceDeps): InstanceSetsService {
  const { sequelize } = deps;
  const generate = deps.generate ?? (async (request: GenerateRequest) => generateEntries(request));
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

  /** Checks the entries against the set, then stores all of them in one transaction. */
  async function storeEntries(set: InstanceSet, entries: readonly UploadEntry[], skipped: readonly string[], earlier: readonly UploadProblem[]): Promise<UploadResponse> {
    const [mapRows, scenarioRows] = await Promise.all([
      MapFile.findAll({ where: { instanceSetId: set.id }, attributes: ['name'] }),
      ScenarioFile.findAll({ where: { instanceSetId: set.id }, attributes: ['name'] }),
    ]);
    const wanted = scenarioMapNames(entries).filter((n) => mapRows.some((m) => m.name === n));
    const referenced = wanted.length === 0 ? [] : await MapFile.findAll({
      where: { instanceSetId: set.id, name: { [Op.in]: wanted } }, attributes: ['id', 'name', 'type', 'cells'],
    });
    const existingMaps = new Map<string, GridMap>(referenced.map((m) => [m.name, gridMapFromRows(m.cells.split('\n'), { name: m.name, type: m.type })]));
    const checked: CheckedUpload = checkUpload(entries, {
      mapNames: new Set(mapRows.map((m) => m.name)),
      scenarioNames: new Set(scenarioRows.map((s) => s.name)),
      maps: existingMaps,
    });
    const problems = [...earlier, ...checked.problems];
    if (problems.length > 0) throw new AppError(INVALID_INSTANCE_FILES, 400, problemsMessage(problems), problems);

    return sequelize.transaction(async (transaction) => {
      const storedMaps = await MapFile.bulkCreate(checked.maps.map((m) => ({
        instanceSetId: set.id, name: m.name, type: m.map.type, width: m.map.width, height: m.map.height,
        passableCount: m.passableCount, cells: m.map.cellsText.join('\n'), checksum: m.checksum,
        byteSize: m.bytes.length, original: m.bytes,
      })), { transaction, returning: [...MAP_SUMMARY_ATTRIBUTES] });
      const mapIds = new Map<string, number>([
        ...referenced.map((m) => [m.name, m.id] as const),
        ...storedMaps.map((m) => [m.name, m.id] as const),
      ]);
      const storedScenarios = await ScenarioFile.bulkCreate(checked.scenarios.map((s) => ({
        instanceSetId: set.id, mapId: mapIds.get(s.mapName) as number, name: s.name,
        rows: s.scenario.rows.map((r): StoredScenarioRow => [r.bucket, r.start[0], r.start[1], r.goal[0], r.goal[1], r.optimalLength]),
        rowCount: s.scenario.rows.length, maxAgents: s.maxAgents, checksum: s.checksum,
        byteSize: s.bytes.length, original: s.bytes,
      })), { transaction, returning: [...SCENARIO_SUMMARY_ATTRIBUTES] });
      set.changed('updatedAt', true);
      await set.save({ transaction });
      return { maps: storedMaps.map(toMapSummary), scenarios: storedScenarios.map(toScenarioSummary), skipped };
    });
  }

  return {
    async create(owner, body) {
      const input = validate(CreateInstanceSetRequest, body);
      const taken = await InstanceSet.count({ where: { ownerId: owner.id, name: input.name } });
      if (taken > 0) throw new AppError('CONFLICT', 409, `You already have an instance set named "${input.name}".`);
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

    async upload(viewer, id, files) {
      const set = await manageableSet(viewer, id);
      const collected = await collectUpload(files);
      // Past the byte limit the upload is refused whatever its files say; parsing them would only cost time.
      if (collected.isOverBudget) throw new AppError(INVALID_INSTANCE_FILES, 400, problemsMessage(collected.problems), collected.problems);
      return storeEntries(set, collected.entries, collected.skipped, collected.problems);
    },

    async generate(viewer, body) {
      const request = validate(GenerateInstancesRequest, body);
      const set = await manageableSet(viewer, request.instanceSetId);
      return storeEntries(set, await generate(request, requesterKey(viewer)), [], []);
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
