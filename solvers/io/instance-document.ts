/**
 * Reading and writing Quarterturn's JSON instance format (shared/instance-format.ts, JSON Schema
 * in shared/instance-format.schema.json). Errors carry the line and column of the offending value.
 */
import {
  INSTANCE_FORMAT, INSTANCE_FORMAT_VERSION, InstanceDocumentSchema, type InstanceDocument,
} from '@shared/instance-format';
import type { MapfInstance } from '../instance';
import { gridMapFromRows, type GridMap } from './grid-map';
import { scanJson } from './json-scan';
import { ErrorList, type ParseResult } from './parse-result';

/** An instance read from a document: its optional name, the map and the agents' tasks. */
export interface InstanceFile {
  readonly name?: string;
  readonly map: GridMap;
  readonly instance: MapfInstance;
}

/** Parses an instance document's JSON text, checking it against the instance format. */
export function parseInstanceDocument(text: string): ParseResult<InstanceFile> {
  const scan = scanJson(text);
  if (!scan.ok) return { ok: false, errors: [scan.error] };
  const parsed = InstanceDocumentSchema.safeParse(scan.value);
  if (!parsed.success) {
    const errors = new ErrorList();
    for (const issue of parsed.error.issues) {
      const keys = issue.code === 'unrecognized_keys' ? issue.keys : [];
      const path = keys.length > 0 ? [...issue.path, keys[0]] : issue.path;
      const { line, column } = scan.locate(path);
      // Our own checks already name the field; zod's built-in messages do not.
      const message = issue.code === 'custom' ? issue.message : `${pathText(issue.path)}: ${issue.message}`;
      if (!errors.add(line, column, message)) break;
    }
    return { ok: false, errors: errors.toArray() };
  }
  return { ok: true, value: instanceFromDocument(parsed.data) };
}

/** The map and instance of an already validated document. */
export function instanceFromDocument(doc: InstanceDocument): InstanceFile {
  const map = gridMapFromRows(doc.map.rows, { name: doc.map.name, type: doc.map.type ?? 'octile' });
  const agents = doc.agents.map((a) => ({
    start: a.start[1] * map.width + a.start[0],
    goal: a.goal[1] * map.width + a.goal[0],
    ...(a.startHeading ? { startHeading: a.startHeading } : {}),
  }));
  const file = { map, instance: { grid: map.grid, agents } };
  return doc.name === undefined ? file : { name: doc.name, ...file };
}

/** The document of a map and an instance on it (agents' cells become [x, y]). */
export function instanceToDocument(map: GridMap, instance: MapfInstance, name?: string): InstanceDocument {
  const xy = (cell: number): [number, number] => [cell % map.width, Math.floor(cell / map.width)];
  return {
    format: INSTANCE_FORMAT,
    version: INSTANCE_FORMAT_VERSION,
    ...(name === undefined ? {} : { name }),
    map: {
      ...(map.name === undefined ? {} : { name: map.name }),
      type: map.type,
      width: map.width,
      height: map.height,
      rows: [...map.cellsText],
    },
    agents: instance.agents.map((a) => ({
      start: xy(a.start),
      goal: xy(a.goal),
      ...(a.startHeading ? { startHeading: a.startHeading } : {}),
    })),
  };
}

/** The JSON text of a document: one map row and one agent per line, two-space indent, final newline. */
export function writeInstanceDocument(doc: InstanceDocument): string {
  const j = JSON.stringify;
  const mapFields = Object.entries(doc.map)
    .filter(([key, value]) => key !== 'rows' && value !== undefined)
    .map(([key, value]) => `    ${j(key)}: ${j(value)},`);
  const agents = doc.agents.map((a) => {
    const parts = [`"start": [${a.start[0]}, ${a.start[1]}]`, `"goal": [${a.goal[0]}, ${a.goal[1]}]`];
    if (a.startHeading) parts.push(`"startHeading": ${j(a.startHeading)}`);
    return `    { ${parts.join(', ')} }`;
  });
  return [
    '{',
    `  "format": ${j(doc.format)},`,
    `  "version": ${doc.version},`,
    ...(doc.name === undefined ? [] : [`  "name": ${j(doc.name)},`]),
    '  "map": {',
    ...mapFields,
    '    "rows": [',
    doc.map.rows.map((r) => `      ${j(r)}`).join(',\n'),
    '    ]',
    '  },',
    '  "agents": [',
    agents.join(',\n'),
    '  ]',
    '}',
    '',
  ].join('\n');
}

function pathText(path: readonly PropertyKey[]): string {
  if (path.length === 0) return 'document';
  return path.map((p, i) => (typeof p === 'number' ? `[${p}]` : `${i === 0 ? '' : '.'}${String(p)}`)).join('');
}
