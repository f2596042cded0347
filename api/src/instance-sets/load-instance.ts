/**
 * Builds a MAPF instance from stored files, for sweeps, leaderboards and submissions: the map of
 * a scenario plus its first k rows (R. Stern et al., SoCS 2019). The stored bytes are parsed
 * again with solvers/io, so the instance is exactly what the uploaded files say.
 */
import type { GridMap } from '@solvers/io/grid-map';
import { instanceFromScenario } from '@solvers/io/instance-from-scenario';
import { parseMap } from '@solvers/io/parse-map';
import { formatParseError } from '@solvers/io/parse-result';
import { parseScenario } from '@solvers/io/parse-scenario';
import type { Scenario } from '@solvers/io/scenario';
import type { MapfInstance } from '@solvers/instance';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { isSetVisible, type Viewer } from './instance-set-access';

/** A stored scenario's instance with k agents, and what it was built from. */
export interface LoadedInstance {
  readonly instanceSetId: number;
  readonly mapId: number;
  readonly mapName: string;
  readonly scenarioId: number;
  readonly scenarioName: string;
  readonly map: GridMap;
  readonly scenario: Scenario;
  /** The first `agents` rows as a MapfInstance (cells are y * width + x). */
  readonly instance: MapfInstance;
}

/** Options of loadInstance. */
export interface LoadInstanceOptions {
  /** When given, a scenario in a set this viewer may not see answers 404 like a missing one. */
  readonly viewer?: Viewer;
}

/**
 * The instance of the first `agents` rows of scenario `scenarioId` on its map. Throws 404
 * SCENARIO_NOT_FOUND for an unknown (or, with a viewer, invisible) scenario and 400
 * VALIDATION_FAILED when `agents` is not in 1..maxAgents.
 */
export async function loadInstance(models: Models, scenarioId: number, agents: number, options: LoadInstanceOptions = {}): Promise<LoadedInstance> {
  const scenarioRow = await models.ScenarioFile.findByPk(scenarioId, { attributes: ['id', 'instanceSetId', 'mapId', 'name', 'original'] });
  const mapRow = scenarioRow && (await models.MapFile.findByPk(scenarioRow.mapId, { attributes: ['id', 'name', 'original'] }));
  if (!scenarioRow || !mapRow) throw new AppError('SCENARIO_NOT_FOUND', 404, `No scenario ${scenarioId}`);
  if (options.viewer !== undefined) {
    const set = await models.InstanceSet.findByPk(scenarioRow.instanceSetId, { attributes: ['ownerId', 'visibility'] });
    if (!set || !isSetVisible(set, options.viewer)) throw new AppError('SCENARIO_NOT_FOUND', 404, `No scenario ${scenarioId}`);
  }
  const map = parseMap(mapRow.original.toString('utf8'), { name: mapRow.name.replace(/\.map$/, '') });
  if (!map.ok) throw new Error(`stored map ${mapRow.id} no longer parses: ${formatParseError(map.errors[0], mapRow.name)}`);
  const scenario = parseScenario(scenarioRow.original.toString('utf8'), { map: map.value });
  if (!scenario.ok) throw new Error(`stored scenario ${scenarioRow.id} no longer parses: ${formatParseError(scenario.errors[0], scenarioRow.name)}`);
  const instance = instanceFromScenario(map.value, scenario.value, agents);
  if (!instance.ok) {
    throw new AppError('VALIDATION_FAILED', 400, `Scenario ${scenarioRow.name} cannot give ${agents} agents: ${formatParseError(instance.errors[0], scenarioRow.name)}`);
  }
  return {
    instanceSetId: scenarioRow.instanceSetId, mapId: mapRow.id, mapName: mapRow.name,
    scenarioId: scenarioRow.id, scenarioName: scenarioRow.name,
    map: map.value, scenario: scenario.value, instance: instance.value,
  };
}
