/**
 * JSON with positions: JSON.parse gives none, and errors in uploaded documents (trial logs, batch
 * manifests) must name the line of the bad value.
 */

/** A JSON value with the offset where it starts. */
export type LocatedJson =
  | { readonly kind: 'object'; readonly offset: number; readonly value: unknown; readonly entries: Map<string, LocatedJson> }
  | { readonly kind: 'array'; readonly offset: number; readonly value: unknown; readonly items: LocatedJson[] }
  | { readonly kind: 'scalar'; readonly offset: number; readonly value: unknown };

/** A JSON syntax error at a character offset. */
export class JsonSyntaxError extends Error {
  constructor(message: string, readonly offset: number) {
    super(message);
  }
}

/**
 * A JSON text (RFC 8259) as a tree that keeps where each value starts. Scalars are decoded with
 * JSON.parse, so strings and numbers mean exactly what they mean there; only nesting is done here.
 * A duplicate key is refused (JSON.parse would keep the last one silently).
 */
export function parseLocatedJson(text: string): LocatedJson {
  let i = 0;
  const ws = (): void => {
    while (i < text.length && (text[i] === ' ' || text[i] === '\t' || text[i] === '\n' || text[i] === '\r')) i++;
  };
  const expect = (c: string): void => {
    if (text[i] !== c) throw new JsonSyntaxError(i >= text.length ? `unexpected end, expected "${c}"` : `unexpected ${JSON.stringify(text[i])}, expected "${c}"`, i);
    i++;
  };
  const scalar = (re: RegExp, what: string): LocatedJson => {
    re.lastIndex = i;
    const m = re.exec(text);
    if (!m || m.index !== i) throw new JsonSyntaxError(`malformed ${what}`, i);
    const offset = i;
    i += m[0].length;
    return { kind: 'scalar', offset, value: JSON.parse(m[0]) };
  };
  const STRING = /"(?:[^"\\\u0000-\u001f]|\\(?:["\\/bfnrt]|u[0-9a-fA-F]{4}))*"/y;
  const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;
  const value = (depth: number): LocatedJson => {
    if (depth > 32) throw new JsonSyntaxError('nested too deeply', i);
    ws();
    const offset = i;
    const c = text[i];
    if (c === '{') {
      i++;
      const entries = new Map<string, LocatedJson>();
      const obj: Record<string, unknown> = {};
      ws();
      if (text[i] === '}') {
        i++;
        return { kind: 'object', offset, value: obj, entries };
      }
      for (;;) {
        ws();
        const keyAt = i;
        const key = scalar(STRING, 'string (an object key)').value as string;
        if (entries.has(key)) throw new JsonSyntaxError(`key "${key}" appears twice in one object`, keyAt);
        ws();
        expect(':');
        const v = value(depth + 1);
        entries.set(key, v);
        obj[key] = v.value;
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        expect('}');
        return { kind: 'object', offset, value: obj, entries };
      }
    }
    if (c === '[') {
      i++;
      const items: LocatedJson[] = [];
      ws();
      if (text[i] === ']') {
        i++;
        return { kind: 'array', offset, value: [], items };
      }
      for (;;) {
        items.push(value(depth + 1));
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        expect(']');
        return { kind: 'array', offset, value: items.map((v) => v.value), items };
      }
    }
    if (c === '"') return scalar(STRING, 'string');
    if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) return scalar(NUMBER, 'number');
    for (const [word, v] of [['true', true], ['false', false], ['null', null]] as const) {
      if (text.startsWith(word, i)) {
        i += word.length;
        return { kind: 'scalar', offset, value: v };
      }
    }
    throw new JsonSyntaxError(i >= text.length ? 'unexpected end of the text' : `unexpected ${JSON.stringify(c)}`, i);
  };
  const start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  i = start;
  const root = value(0);
  ws();
  if (i < text.length) throw new JsonSyntaxError(`unexpected ${JSON.stringify(text[i])} after the end of the document`, i);
  return root;
}

/** 1-based line and column of a character offset (line starts indexed once, then a binary search per offset). */
export function lineColumnOf(text: string): (offset: number) => { line: number; column: number } {
  const starts = [0];
  for (let k = text.indexOf('\n'); k >= 0; k = text.indexOf('\n', k + 1)) starts.push(k + 1);
  return (offset) => {
    let lo = 0;
    let hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid] <= offset) lo = mid;
      else hi = mid - 1;
    }
    return { line: lo + 1, column: offset - starts[lo] + 1 };
  };
}

/** The deepest value along `path` (keys and indices, as a zod issue gives them) that the document holds. */
export function locatedAt(root: LocatedJson, path: readonly PropertyKey[]): LocatedJson {
  let node = root;
  for (const step of path) {
    const next = node.kind === 'object' && typeof step === 'string' ? node.entries.get(step)
      : node.kind === 'array' && typeof step === 'number' ? node.items[step] : undefined;
    if (!next) break;
    node = next;
  }
  return node;
}
