/**
 * Quarterturn's field trial log: what one run of a stored plan did on real robots, one row per
 * executed action (README.md, "Field trial logs"). Two spellings of the same rows:
 * - CSV: a header line `robot,action,start_ms,end_ms`, then optionally any of `x_mm`, `y_mm`,
 *   `heading`, `event` in any order; one row per action. Lines starting with `#` and blank lines
 *   are skipped (they still count for line numbers). No quoting: no field of the format needs it.
 * - JSON (`format: "quarterturn-trial-log"`, version 1): `{ format, version, rows: [{ robot,
 *   action, start_ms, end_ms, x_mm?, y_mm?, heading?, event? }] }`, the CSV columns as keys.
 *   JSON Schema twin: shared/trial-log.schema.json (kept equal by shared/trial-log.spec.ts).
 * Rules of both: robot is the agent index (integer 0 … 999); times are ms from the run's start
 * (non-negative, start_ms ≤ end_ms); one robot's rows come in time order and never overlap
 * (rows of different robots may interleave); event marks a collision or an abort, and a robot
 * has no row after its abort. Parsing never throws on bad input: it returns every problem found
 * (up to MAX_REPORTED_ERRORS) with file, line, column and field, or the whole log, never half.
 * Pure: no I/O, zod-free (the web parses logs in the browser too).
 */
import { ACTION_KINDS, HEADINGS, type ActionKind, type Heading } from './plan';
import { JsonSyntaxError, lineColumnOf, parseLocatedJson, type LocatedJson } from './located-json';

/** What a trial row may mark: a collision during the action, or the run aborted during it. */
export const TRIAL_EVENTS = ['collision', 'abort'] as const;
export type TrialEvent = (typeof TRIAL_EVENTS)[number];

/** The CSV columns every log has, in this order at the start of its header. */
export const TRIAL_LOG_REQUIRED_COLUMNS = ['robot', 'action', 'start_ms', 'end_ms'] as const;
/** The CSV columns a log may add after the required ones, in any order, each at most once. */
export const TRIAL_LOG_OPTIONAL_COLUMNS = ['x_mm', 'y_mm', 'heading', 'event'] as const;
export type TrialLogColumn = (typeof TRIAL_LOG_REQUIRED_COLUMNS)[number] | (typeof TRIAL_LOG_OPTIONAL_COLUMNS)[number];

/** The JSON form's `format` value. */
export const TRIAL_LOG_FORMAT = 'quarterturn-trial-log';
/** The JSON form's `version` value. */
export const TRIAL_LOG_VERSION = 1;

/** Largest log file accepted, in bytes (UTF-8), either form. */
export const MAX_TRIAL_LOG_BYTES = 8 * 1024 * 1024;
/** Most action rows one log may hold. */
export const MAX_TRIAL_LOG_ROWS = 100_000;
/** Largest robot index (robots are agents, and an instance has at most 1000). */
export const MAX_TRIAL_ROBOT = 999;
/** Latest time a row may name: 24 h after the run's start. */
export const MAX_TRIAL_TIME_MS = 24 * 3600 * 1000;
/** Problems reported at most per file; the rest are summed up in one last error. */
export const MAX_REPORTED_ERRORS = 20;

/** One executed action of one robot, as logged. Times in ms from the run's start; positions in mm. */
export interface TrialRow {
  readonly robot: number;
  readonly action: ActionKind;
  readonly startMs: number;
  readonly endMs: number;
  /** Where the robot was when the action ended, mm from the centre of cell [0, 0] (x right, y down); absent when not logged. */
  readonly xMm?: number;
  readonly yMm?: number;
  /** The robot's heading when the action ended; absent when not logged. */
  readonly heading?: Heading;
  readonly event?: TrialEvent;
  /** 1-based line of the row in its file (the CSV line, or the line where the JSON row object starts). */
  readonly line: number;
}

/** One parsed log: one run's rows in file order. */
export interface TrialLog {
  readonly file: string;
  readonly format: 'csv' | 'json';
  readonly rows: readonly TrialRow[];
}

/**
 * One problem of a log. `line` and `column` are 1-based (column counts characters of the line);
 * null when the problem has no place (an empty file, too many bytes). `field` is the CSV column
 * or JSON key, or a JSON path (`rows[3]`); null for the file as a whole.
 */
export interface TrialLogError {
  readonly file: string;
  readonly line: number | null;
  readonly column: number | null;
  readonly field: string | null;
  readonly message: string;
}

/** A parse outcome: the whole log, or every problem found (nothing half-read). */
export type TrialLogParse =
  | { readonly kind: 'parsed'; readonly log: TrialLog }
  | { readonly kind: 'invalid'; readonly errors: readonly TrialLogError[] };

/** One error as text: `file:line:column: field: message` (parts without a place left out). */
export function formatTrialLogError(e: TrialLogError): string {
  const place = [e.file, e.line, e.line !== null ? e.column : null].filter((p) => p !== null).join(':');
  return `${place}: ${e.field !== null ? `${e.field}: ` : ''}${e.message}`;
}

/** Which spelling a file is: by its extension (.csv, .json), else by its first non-blank character (`{` = JSON). */
export function trialLogFormatOf(file: string, text: string): 'csv' | 'json' {
  const lower = file.toLowerCase();
  if (lower.endsWith('.json')) return 'json';
  if (lower.endsWith('.csv')) return 'csv';
  return /^\s*\{/.test(text) ? 'json' : 'csv';
}

/** Parses a log in either spelling (trialLogFormatOf decides which). */
export function parseTrialLog(file: string, text: string): TrialLogParse {
  return trialLogFormatOf(file, text) === 'json' ? parseTrialLogJson(file, text) : parseTrialLogCsv(file, text);
}

/** Parses the CSV spelling. */
export function parseTrialLogCsv(file: string, text: string): TrialLogParse {
  const errors = new ErrorList(file);
  if (!checkSize(text, errors)) return errors.result();
  const lines = text.split(/\r?\n/);
  const headerIndex = lines.findIndex((l) => !isSkipped(l));
  if (headerIndex < 0) {
    errors.add(null, null, null, 'the file holds no header line (expected "robot,action,start_ms,end_ms")');
    return errors.result();
  }
  const header = splitLine(lines[headerIndex].replace(/^\uFEFF/, ''));
  const columns = readHeader(header, headerIndex + 1, errors);
  if (!columns) return errors.result();
  const rows: TrialRow[] = [];
  const order = new RowOrder(errors);
  for (let i = headerIndex + 1; i < lines.length && !errors.isFull; i++) {
    if (isSkipped(lines[i])) continue;
    const line = i + 1;
    if (rows.length >= MAX_TRIAL_LOG_ROWS) {
      errors.add(line, 1, null, `more than ${MAX_TRIAL_LOG_ROWS} action rows (the limit of one log)`);
      break;
    }
    const cells = splitLine(lines[i]);
    if (cells.length !== columns.length) {
      const at = cells.length > columns.length ? cells[columns.length].column : lines[i].length + 1;
      errors.add(line, at, null, `has ${cells.length} fields but the header has ${columns.length} columns`);
      continue;
    }
    const raw: Partial<Record<TrialLogColumn, RawValue>> = {};
    const quoted = columns.filter((name, k) => cells[k].text.includes('"'));
    for (const name of quoted) errors.add(line, cells[columns.indexOf(name)].column, name, 'quoted fields are not used in trial logs');
    if (quoted.length > 0) continue;
    columns.forEach((name, k) => {
      raw[name] = { value: cells[k].text === '' ? undefined : cells[k].text, column: cells[k].column };
    });
    const row = readRow(raw, line, 'csv', errors);
    if (row) {
      order.check(row, (field) => raw[field]?.column ?? 1);
      rows.push(row);
    }
  }
  if (rows.length === 0 && errors.count === 0) errors.add(null, null, null, 'the log has a header but no action rows');
  return errors.count > 0 ? errors.result() : { kind: 'parsed', log: { file, format: 'csv', rows } };
}

/** Parses the JSON spelling; errors name the JSON path (`rows[3].end_ms`) as field, and its line and column. */
export function parseTrialLogJson(file: string, text: string): TrialLogParse {
  const errors = new ErrorList(file);
  if (!checkSize(text, errors)) return errors.result();
  let doc: LocatedJson;
  try {
    doc = parseLocatedJson(text);
  } catch (e) {
    const at = e instanceof JsonSyntaxError ? lineColumnOf(text)(e.offset) : { line: null, column: null };
    errors.add(at.line, at.column, null, `not valid JSON: ${e instanceof Error ? e.message : String(e)}`);
    return errors.result();
  }
  const position = lineColumnOf(text);
  const where = (v: LocatedJson): { line: number; column: number } => position(v.offset);
  if (doc.kind !== 'object') {
    errors.add(where(doc).line, where(doc).column, null, 'a trial log in JSON is an object { "format", "version", "rows" }');
    return errors.result();
  }
  const top = doc.entries;
  const allowed = ['format', 'version', 'rows'];
  for (const [key, v] of top) {
    if (!allowed.includes(key)) errors.add(where(v).line, where(v).column, key, `unknown key (a log has ${allowed.map((k) => `"${k}"`).join(', ')})`);
  }
  const format = top.get('format');
  if (!format || format.value !== TRIAL_LOG_FORMAT) {
    const at = format ? where(format) : where(doc);
    errors.add(at.line, at.column, 'format', `must be "${TRIAL_LOG_FORMAT}"`);
  }
  const version = top.get('version');
  if (!version || version.value !== TRIAL_LOG_VERSION) {
    const at = version ? where(version) : where(doc);
    errors.add(at.line, at.column, 'version', `must be ${TRIAL_LOG_VERSION}`);
  }
  const rowsValue = top.get('rows');
  if (!rowsValue || rowsValue.kind !== 'array') {
    const at = rowsValue ? where(rowsValue) : where(doc);
    errors.add(at.line, at.column, 'rows', 'must be an array of action rows');
    return errors.result();
  }
  if (rowsValue.items.length > MAX_TRIAL_LOG_ROWS) {
    const at = where(rowsValue.items[MAX_TRIAL_LOG_ROWS]);
    errors.add(at.line, at.column, `rows[${MAX_TRIAL_LOG_ROWS}]`, `more than ${MAX_TRIAL_LOG_ROWS} action rows (the limit of one log)`);
    return errors.result();
  }
  if (rowsValue.items.length === 0) {
    const at = where(rowsValue);
    errors.add(at.line, at.column, 'rows', 'the log has no action rows');
  }
  const rows: TrialRow[] = [];
  const order = new RowOrder(errors);
  const columns = new Set<string>([...TRIAL_LOG_REQUIRED_COLUMNS, ...TRIAL_LOG_OPTIONAL_COLUMNS]);
  rowsValue.items.forEach((item, i) => {
    if (errors.isFull) return;
    const at = where(item);
    if (item.kind !== 'object') {
      errors.add(at.line, at.column, `rows[${i}]`, 'an action row is an object { "robot", "action", "start_ms", "end_ms", … }');
      return;
    }
    const raw: Partial<Record<TrialLogColumn, RawValue>> = {};
    let isBad = false;
    for (const [key, v] of item.entries) {
      const vAt = where(v);
      if (!columns.has(key)) {
        errors.add(vAt.line, vAt.column, `rows[${i}].${key}`, `unknown key (a row has ${[...columns].join(', ')})`);
        isBad = true;
        continue;
      }
      raw[key as TrialLogColumn] = { value: v.value === null ? undefined : v.value, column: vAt.column, line: vAt.line };
    }
    if (isBad) return;
    const row = readRow(raw, at.line, `rows[${i}]`, errors, at.column);
    if (row) {
      order.check(row, (field) => raw[field]?.column ?? at.column, (field) => raw[field]?.line ?? at.line, `rows[${i}].`);
      rows.push(row);
    }
  });
  return errors.count > 0 ? errors.result() : { kind: 'parsed', log: { file, format: 'json', rows } };
}

// ---------------------------------------------------------------------------------------------
// Row rules, shared by both spellings

/** One field as read: a CSV cell's text or a JSON value (undefined = empty / null / absent), and where it starts. */
interface RawValue {
  readonly value: unknown;
  readonly column: number;
  /** JSON only: the line of the value (a JSON row may span lines). */
  readonly line?: number;
}

/**
 * Checks one row's fields and returns it, or null after adding its problems. `where` is `csv`
 * (fields are named by column) or the JSON path of the row (fields are named `rows[i].key`).
 */
function readRow(
  raw: Partial<Record<TrialLogColumn, RawValue>>, line: number, where: 'csv' | string, errors: ErrorList, rowColumn = 1,
): TrialRow | null {
  const before = errors.count;
  const isCsv = where === 'csv';
  const name = (field: TrialLogColumn): string => (isCsv ? field : `${where}.${field}`);
  const fail = (field: TrialLogColumn, message: string): void => {
    const v = raw[field];
    errors.add(v?.line ?? line, v?.column ?? rowColumn, name(field), message);
  };
  const required = (field: TrialLogColumn): unknown => {
    const v = raw[field]?.value;
    if (v === undefined) fail(field, 'is required');
    return v;
  };
  const integer = (field: TrialLogColumn, max: number): number | undefined => {
    const v = required(field);
    if (v === undefined) return undefined;
    const n = isCsv ? (typeof v === 'string' && /^\d+$/.test(v) ? Number(v) : NaN) : v;
    if (typeof n !== 'number' || !Number.isInteger(n) || n < 0 || n > max) {
      fail(field, `must be an integer from 0 to ${max}, got ${shown(v)}`);
      return undefined;
    }
    return n;
  };
  const number = (field: TrialLogColumn, isTime: boolean): number | undefined => {
    const v = raw[field]?.value;
    if (v === undefined) {
      if (isTime) fail(field, 'is required');
      return undefined;
    }
    const n = isCsv ? (typeof v === 'string' && /^-?\d+(\.\d+)?$/.test(v) ? Number(v) : NaN) : v;
    if (typeof n !== 'number' || !Number.isFinite(n)) {
      fail(field, `must be a number${isCsv ? ' (digits, an optional point and decimals)' : ''}, got ${shown(v)}`);
      return undefined;
    }
    if (isTime && (n < 0 || n > MAX_TRIAL_TIME_MS)) {
      fail(field, `must be from 0 to ${MAX_TRIAL_TIME_MS} ms (24 h after the run's start), got ${shown(v)}`);
      return undefined;
    }
    return n;
  };
  const choice = <T extends string>(field: TrialLogColumn, allowed: readonly T[], isRequired: boolean): T | undefined => {
    const v = isRequired ? required(field) : raw[field]?.value;
    if (v === undefined) return undefined;
    if (typeof v !== 'string' || !(allowed as readonly string[]).includes(v)) {
      fail(field, `must be one of ${allowed.join(', ')}, got ${shown(v)}`);
      return undefined;
    }
    return v as T;
  };

  const robot = integer('robot', MAX_TRIAL_ROBOT);
  const action = choice('action', ACTION_KINDS, true);
  const startMs = number('start_ms', true);
  const endMs = number('end_ms', true);
  const xMm = number('x_mm', false);
  const yMm = number('y_mm', false);
  const heading = choice('heading', HEADINGS, false);
  const event = choice('event', TRIAL_EVENTS, false);
  if (startMs !== undefined && endMs !== undefined && endMs < startMs) fail('end_ms', `is ${endMs}, before start_ms ${startMs}`);
  if ((xMm === undefined) !== (yMm === undefined) && errors.count === before) {
    fail(xMm === undefined ? 'x_mm' : 'y_mm', 'x_mm and y_mm come together (both or neither)');
  }
  if (errors.count > before || robot === undefined || action === undefined || startMs === undefined || endMs === undefined) return null;
  return {
    robot, action, startMs, endMs, line,
    ...(xMm !== undefined && yMm !== undefined ? { xMm, yMm } : {}),
    ...(heading !== undefined ? { heading } : {}),
    ...(event !== undefined ? { event } : {}),
  };
}

/** Per robot: rows in time order, never overlapping, none after an abort. */
class RowOrder {
  private readonly last = new Map<number, TrialRow>();

  constructor(private readonly errors: ErrorList) {}

  check(row: TrialRow, columnOf: (field: TrialLogColumn) => number, lineOf: (field: TrialLogColumn) => number = () => row.line, prefix = ''): void {
    const prev = this.last.get(row.robot);
    this.last.set(row.robot, row);
    if (!prev) return;
    if (prev.event === 'abort') {
      this.errors.add(lineOf('robot'), columnOf('robot'), `${prefix}robot`, `robot ${row.robot} aborted at line ${prev.line} and has no later rows`);
    } else if (row.startMs < prev.endMs) {
      this.errors.add(
        lineOf('start_ms'), columnOf('start_ms'), `${prefix}start_ms`,
        `robot ${row.robot} starts this action at ${row.startMs} ms, before its previous action (line ${prev.line}) ends at ${prev.endMs} ms: one robot's rows come in time order and do not overlap`,
      );
    }
  }
}

class ErrorList {
  private readonly list: TrialLogError[] = [];
  private dropped = 0;

  constructor(private readonly file: string) {}

  get count(): number {
    return this.list.length + this.dropped;
  }

  /** Whether enough problems are listed to stop looking. */
  get isFull(): boolean {
    return this.list.length >= MAX_REPORTED_ERRORS;
  }

  add(line: number | null, column: number | null, field: string | null, message: string): void {
    if (this.isFull) this.dropped++;
    else this.list.push({ file: this.file, line, column, field, message });
  }

  result(): TrialLogParse {
    const errors = this.isFull
      ? [...this.list, { file: this.file, line: null, column: null, field: null, message: `stopped after ${MAX_REPORTED_ERRORS} problems; fix these and try again` }]
      : this.list;
    return { kind: 'invalid', errors };
  }
}

function checkSize(text: string, errors: ErrorList): boolean {
  // A UTF-8 byte count without Buffer (the web uses this file too): at most 3 bytes per UTF-16 unit.
  if (text.length * 3 > MAX_TRIAL_LOG_BYTES && new TextEncoder().encode(text).length > MAX_TRIAL_LOG_BYTES) {
    errors.add(null, null, null, `the file is larger than ${MAX_TRIAL_LOG_BYTES} bytes (the limit of one log); split the run's log or drop optional columns`);
    return false;
  }
  if (text.trim() === '') {
    errors.add(null, null, null, 'the file is empty');
    return false;
  }
  return true;
}

function shown(v: unknown): string {
  const s = typeof v === 'string' ? JSON.stringify(v) : JSON.stringify(v) ?? String(v);
  return s.length > 40 ? `${s.slice(0, 37)}…` : s;
}

// ---------------------------------------------------------------------------------------------
// CSV lines

function isSkipped(line: string): boolean {
  const t = line.trim();
  return t === '' || t.startsWith('#');
}

/** The comma-separated fields of a line, trimmed, each with the 1-based column where its text starts. */
function splitLine(line: string): { text: string; column: number }[] {
  const out: { text: string; column: number }[] = [];
  let at = 0;
  for (const part of line.split(',')) {
    const lead = part.length - part.trimStart().length;
    out.push({ text: part.trim(), column: at + lead + 1 });
    at += part.length + 1;
  }
  return out;
}

function readHeader(cells: { text: string; column: number }[], line: number, errors: ErrorList): TrialLogColumn[] | null {
  const expected = TRIAL_LOG_REQUIRED_COLUMNS.join(',');
  const columns: TrialLogColumn[] = [];
  TRIAL_LOG_REQUIRED_COLUMNS.forEach((name, k) => {
    const cell = cells[k];
    if (!cell) errors.add(line, (cells.at(-1)?.column ?? 1) + (cells.at(-1)?.text.length ?? 0), name, `the header lacks column "${name}": it starts with ${expected}`);
    else if (cell.text !== name) errors.add(line, cell.column, name, `column ${k + 1} of the header must be "${name}", got ${shown(cell.text)}: the header starts with ${expected}`);
    else columns.push(name);
  });
  for (const cell of cells.slice(TRIAL_LOG_REQUIRED_COLUMNS.length)) {
    const name = cell.text as TrialLogColumn;
    if (!(TRIAL_LOG_OPTIONAL_COLUMNS as readonly string[]).includes(name)) {
      errors.add(line, cell.column, cell.text, `unknown column ${shown(cell.text)} (optional columns: ${TRIAL_LOG_OPTIONAL_COLUMNS.join(', ')})`);
    } else if (columns.includes(name)) {
      errors.add(line, cell.column, cell.text, `column "${name}" appears twice`);
    } else {
      columns.push(name);
    }
  }
  return errors.count > 0 ? null : columns;
}

/**
 * A log as CSV text (the inverse of parseTrialLogCsv): the required columns, then those optional
 * columns some row fills, rows in the given order. Numbers keep every digit JavaScript prints for
 * them, so parsing the text gives the same numbers back.
 */
export function formatTrialLogCsv(rows: readonly Omit<TrialRow, 'line'>[]): string {
  const optional = TRIAL_LOG_OPTIONAL_COLUMNS.filter((c) => rows.some((r) => (c === 'x_mm' || c === 'y_mm' ? r.xMm !== undefined : r[c] !== undefined)));
  const lines = [[...TRIAL_LOG_REQUIRED_COLUMNS, ...optional].join(',')];
  for (const r of rows) {
    const cells = [String(r.robot), r.action, decimal(r.startMs), decimal(r.endMs)];
    for (const c of optional) {
      const v = c === 'x_mm' ? r.xMm : c === 'y_mm' ? r.yMm : r[c];
      cells.push(v === undefined ? '' : typeof v === 'number' ? decimal(v) : v);
    }
    lines.push(cells.join(','));
  }
  return `${lines.join('\n')}\n`;
}

/** A number in the CSV's plain decimal notation (no exponent). */
function decimal(n: number): string {
  const s = String(n);
  return /e/i.test(s) ? n.toFixed(20).replace(/\.?0+$/, '') : s;
}

/** A log as JSON text (the inverse of parseTrialLogJson), one row per line. */
export function formatTrialLogJson(rows: readonly Omit<TrialRow, 'line'>[]): string {
  const objects = rows.map((r) => JSON.stringify({
    robot: r.robot, action: r.action, start_ms: r.startMs, end_ms: r.endMs,
    ...(r.xMm !== undefined ? { x_mm: r.xMm, y_mm: r.yMm } : {}),
    ...(r.heading !== undefined ? { heading: r.heading } : {}),
    ...(r.event !== undefined ? { event: r.event } : {}),
  }));
  return `{\n  "format": "${TRIAL_LOG_FORMAT}",\n  "version": ${TRIAL_LOG_VERSION},\n  "rows": [\n${objects.map((o) => `    ${o}`).join(',\n')}\n  ]\n}\n`;
}
