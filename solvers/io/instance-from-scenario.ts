/**
 * Builds a MAPF instance from a map and the first k rows of its scenario (the field's
 * convention: R. Stern et al., "Multi-Agent Pathfinding: Definitions, Variants, and
 * Benchmarks", SoCS 2019). No two of those agents may share a start or a goal.
 */
import type { MapfInstance } from '../instance';
import type { GridMap } from './grid-map';
import { checkScenarioRow } from './parse-scenario';
import { ErrorList, type ParseResult } from './parse-result';
import type { Scenario } from './scenario';

const START_X = 4;
const GOAL_X = 6;

/** The instance of the first `k` scenario rows on `map`, or errors naming the offending rows' lines. */
export function instanceFromScenario(map: GridMap, scenario: Scenario, k: number): ParseResult<MapfInstance> {
  const errors = new ErrorList();
  if (!Number.isInteger(k) || k < 1 || k > scenario.rows.length) {
    errors.add(0, 0, `agent count ${k} is not a whole number from 1 to ${scenario.rows.length} (the scenario's rows)`);
    return { ok: false, errors: errors.toArray() };
  }
  const rows = scenario.rows.slice(0, k);
  for (const row of rows) checkScenarioRow(row, map, errors);
  if (errors.hasErrors) return { ok: false, errors: errors.toArray() };
  const startLine = new Map<number, number>();
  const goalLine = new Map<number, number>();
  const agents = rows.map((row) => {
    const start = row.start[1] * map.width + row.start[0];
    const goal = row.goal[1] * map.width + row.goal[0];
    const otherStart = startLine.get(start);
    if (otherStart !== undefined) {
      errors.add(row.line, row.fieldColumns[START_X],
        `start (${row.start[0]}, ${row.start[1]}) is also the start of the agent on line ${otherStart}`);
    } else {
      startLine.set(start, row.line);
    }
    const otherGoal = goalLine.get(goal);
    if (otherGoal !== undefined) {
      errors.add(row.line, row.fieldColumns[GOAL_X],
        `goal (${row.goal[0]}, ${row.goal[1]}) is also the goal of the agent on line ${otherGoal}`);
    } else {
      goalLine.set(goal, row.line);
    }
    return { start, goal };
  });
  if (errors.hasErrors) return { ok: false, errors: errors.toArray() };
  return { ok: true, value: { grid: map.grid, agents } };
}

/**
 * The largest k for which the first k rows have pairwise distinct starts and distinct goals
 * (every smaller k is then valid too): the agent counts a scenario can offer.
 */
export function largestAgentCount(scenario: Scenario): number {
  const starts = new Set<string>();
  const goals = new Set<string>();
  for (let i = 0; i < scenario.rows.length; i++) {
    const { start, goal } = scenario.rows[i];
    const s = `${start[0]},${start[1]}`;
    const g = `${goal[0]},${goal[1]}`;
    if (starts.has(s) || goals.has(g)) return i;
    starts.add(s);
    goals.add(g);
  }
  return scenario.rows.length;
}
