/// <reference types="node" />
/**
 * Test helper: instances from the open grid benchmark files, read in place from
 * benchmarks/datasets/grid-benchmarks/ (N. Sturtevant, "Benchmarks for Grid-Based Pathfinding",
 * IEEE TCIAIG 4(2), 2012; R. Stern et al., "Multi-Agent Pathfinding: Definitions, Variants,
 * and Benchmarks", SoCS 2019). An instance with k agents uses the first k scenario rows.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { MapfInstance } from '../../instance';
import { instanceFromScenario } from '../../io/instance-from-scenario';
import { parseMap } from '../../io/parse-map';
import { parseScenario } from '../../io/parse-scenario';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../../benchmarks/datasets/open-grid-benchmarks';

const DATASET = OPEN_GRID_BENCHMARKS_DIR;

/** The instance of `mapName` with the first `agents` rows of scenario `scenarioName`. */
export function datasetInstance(mapName: string, scenarioName: string, agents: number): MapfInstance {
  const map = parseMap(readFileSync(join(DATASET, `${mapName}.map`), 'utf8'));
  if (!map.ok) throw new Error(`${mapName}.map: ${map.errors[0].message}`);
  const scenario = parseScenario(readFileSync(join(DATASET, `${scenarioName}.scen`), 'utf8'));
  if (!scenario.ok) throw new Error(`${scenarioName}.scen: ${scenario.errors[0].message}`);
  const instance = instanceFromScenario(map.value, scenario.value, agents);
  if (!instance.ok) throw new Error(`${scenarioName}.scen: ${instance.errors[0].message}`);
  return instance.value;
}
