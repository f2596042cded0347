/** Converts stored rows to the response shapes of shared/instance-sets.ts. */
import type { MapSummary, ScenarioRowView, ScenarioSummary } from '@shared/instance-sets';
import type { MapFile } from './map-file.model';
import type { ScenarioFile, StoredScenarioRow } from './scenario-file.model';

/** Attributes every map query selects for a summary (never the cells or bytes). */
export const MAP_SUMMARY_ATTRIBUTES = ['id', 'instanceSetId', 'name', 'width', 'height', 'passableCount', 'checksum', 'byteSize'] as const;

/** Attributes every scenario query selects for a summary (never the rows or bytes). */
export const SCENARIO_SUMMARY_ATTRIBUTES = ['id', 'instanceSetId', 'mapId', 'name', 'rowCount', 'maxAgents', 'checksum', 'byteSize'] as const;

/** The client view of a map row without its cells. */
export function toMapSummary(m: Pick<MapFile, (typeof MAP_SUMMARY_ATTRIBUTES)[number]>): MapSummary {
  return {
    id: m.id, instanceSetId: m.instanceSetId, name: m.name, width: m.width, height: m.height,
    passableCount: m.passableCount, checksum: m.checksum, byteSize: m.byteSize,
  };
}

/** The client view of a scenario row without its rows. */
export function toScenarioSummary(s: Pick<ScenarioFile, (typeof SCENARIO_SUMMARY_ATTRIBUTES)[number]>): ScenarioSummary {
  return {
    id: s.id, instanceSetId: s.instanceSetId, mapId: s.mapId, name: s.name,
    rowCount: s.rowCount, maxAgents: s.maxAgents, checksum: s.checksum, byteSize: s.byteSize,
  };
}

/** The client view of one stored scenario row. */
export function toRowView([bucket, sx, sy, gx, gy, optimalLength]: StoredScenarioRow): ScenarioRowView {
  return { bucket, start: [sx, sy], goal: [gx, gy], optimalLength };
}
