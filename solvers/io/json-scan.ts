/**
 * A strict JSON reader (RFC 8259) that also remembers where each value starts, so that errors
 * found later by a schema can be reported with a line and column. JSON.parse gives neither
 * positions of values nor, on Node 20, reliably the position of a syntax error.
 */
import type { ParseError } from './parse-result';

/** A path into a JSON value: object keys and array indices, as zod issue paths are. */
export type JsonPath = readonly PropertyKey[];

/** Where a value of the scanned text starts. */
export interface JsonPosition {
  readonly line: number;
  readonly column: number;
}

/** The result of scanJson: the value and a locator for paths in it, or the first syntax error. */
export type JsonScan =
  | { readonly ok: true; readonly value: unknown; locate(path: JsonPath): JsonPosition }
  | { readonly ok: false; readonly error: ParseError };

/** Deepest nesting accepted (deeper input is surely not an instance and could exhaust the stack). */
const MAX_DEPTH = 256;
const NUMBER = /-?(?:0|[1-9][0-9]*)(?:\.[0-9]+)?(?:[eE][+-]?[0-9]+)?/y;
const ESCAPES: Record<string, string> = { '"': '"', '\\': '\\', '/': '/', b: '\b', f: '\f', n: '\n', r: '\r', t: '\t' };

class JsonSyntaxError extends Error {
  constructor(readonly offset: number, message: string) {
    super(message);
  }
}

const keyOf = (path: JsonPath): string => path.map((p) => `\u0000${String(p)}`).join('');

/** Parses JSON text; on success `locate(path)` gives the start of the value at `path` (or its nearest recorded parent). */
export function scanJson(text: string): JsonScan {
  const starts = new Map<string, number>();
  let pos = text.startsWith('\uFEFF') ? 1 : 0;

  const fail = (message: string, at = pos): never => {
    throw new JsonSyntaxError(at, message);
  };
  const skipSpace = (): void => {
    for (;;) {
      const c = text.charCodeAt(pos);
      if (c === 0x20 || c === 0x09 || c === 0x0a || c === 0x0d) pos++;
      else return;
    }
  };
  const shown = (): string => (pos >= text.length ? 'the end of the text' : `'${text[pos]}'`);

  const readString = (): string => {
    pos++;
    let out = '';
    let from = pos;
    for (;;) {
      if (pos >= text.length) fail('unterminated string');
      const c = text.charCodeAt(pos);
      if (c === 0x22) {
        out += text.slice(from, pos++);
        return out;
      }
      if (c < 0x20) fail('control character inside a string (escape it)');
      if (c !== 0x5c) {
        pos++;
        continue;
      }
      out += text.slice(from, pos);
      const e = text[pos + 1];
      if (e === 'u') {
        const hex = text.slice(pos + 2, pos + 6);
        if (!/^[0-9a-fA-F]{4}$/.test(hex)) fail('invalid \\u escape');
        out += String.fromCharCode(parseInt(hex, 16));
        pos += 6;
      } else if (e !== undefined && ESCAPES[e] !== undefined) {
        out += ESCAPES[e];
        pos += 2;
      } else {
        fail('invalid escape in a string');
      }
      from = pos;
    }
  };

  const readValue = (path: string, depth: number): unknown => {
    if (depth > MAX_DEPTH) fail(`nesting deeper than ${MAX_DEPTH} levels`);
    skipSpace();
    starts.set(path, pos);
    const c = text[pos];
    if (c === '{') {
      pos++;
      const obj: Record<string, unknown> = {};
      skipSpace();
      if (text[pos] === '}') {
        pos++;
        return obj;
      }
      for (;;) {
        skipSpace();
        if (text[pos] !== '"') fail(`expected a property name in double quotes, found ${shown()}`);
        const key = readString();
        skipSpace();
        if (text[pos] !== ':') fail(`expected ':' after the property name, found ${shown()}`);
        pos++;
        // defineProperty, as JSON.parse does, so that a key named __proto__ stays plain data.
        Object.defineProperty(obj, key, { value: readValue(`${path}\u0000${key}`, depth + 1), enumerable: true, writable: true, configurable: true });
        skipSpace();
        if (text[pos] === ',') {
          pos++;
          continue;
        }
        if (text[pos] === '}') {
          pos++;
          return obj;
        }
        fail(`expected ',' or '}' in an object, found ${shown()}`);
      }
    }
    if (c === '[') {
      pos++;
      const arr: unknown[] = [];
      skipSpace();
      if (text[pos] === ']') {
        pos++;
        return arr;
      }
      for (;;) {
        arr.push(readValue(`${path}\u0000${arr.length}`, depth + 1));
        skipSpace();
        if (text[pos] === ',') {
          pos++;
          continue;
        }
        if (text[pos] === ']') {
          pos++;
          return arr;
        }
        fail(`expected ',' or ']' in an array, found ${shown()}`);
      }
    }
    if (c === '"') return readString();
    for (const [word, value] of [['true', true], ['false', false], ['null', null]] as const) {
      if (text.startsWith(word, pos)) {
        pos += word.length;
        return value;
      }
    }
    NUMBER.lastIndex = pos;
    const match = NUMBER.exec(text);
    if (match) {
      pos += match[0].length;
      return Number(match[0]);
    }
    return fail(`expected a JSON value, found ${shown()}`);
  };

  let lineStarts: number[] | undefined;
  const positionOf = (offset: number): JsonPosition => {
    if (!lineStarts) {
      lineStarts = [0];
      for (let i = 0; i < text.length; i++) if (text.charCodeAt(i) === 0x0a) lineStarts.push(i + 1);
    }
    let lo = 0;
    let hi = lineStarts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (lineStarts[mid] <= offset) lo = mid;
      else hi = mid - 1;
    }
    return { line: lo + 1, column: Array.from(text.slice(lineStarts[lo], offset)).length + 1 };
  };

  try {
    const value = readValue('', 0);
    skipSpace();
    if (pos < text.length) fail('unexpected text after the JSON value');
    return {
      ok: true,
      value,
      locate(path) {
        for (let n = path.length; n >= 0; n--) {
          const offset = starts.get(keyOf(path.slice(0, n)));
          if (offset !== undefined) return positionOf(offset);
        }
        return { line: 1, column: 1 };
      },
    };
  } catch (error) {
    if (!(error instanceof JsonSyntaxError)) throw error;
    const { line, column } = positionOf(Math.min(error.offset, text.length));
    return { ok: false, error: { line, column, message: `invalid JSON: ${error.message}` } };
  }
}
