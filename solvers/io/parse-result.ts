/**
 * The outcome of every parser in solvers/io: a value, or every error found (up to a bound),
 * each with a 1-based line and column so that a person can find the mistake in the file.
 */

/** One problem in an input text. Line and column are 1-based; 0 means "the whole file". */
export interface ParseError {
  readonly line: number;
  readonly column: number;
  readonly message: string;
}

/** A parsed value, or the list of errors that prevented it. */
export type ParseResult<T> =
  | { readonly ok: true; readonly value: T }
  | { readonly ok: false; readonly errors: readonly ParseError[] };

/** How many errors a parser reports before it adds a final "more errors" note and stops. */
export const MAX_PARSE_ERRORS = 100;

/** Collects errors up to MAX_PARSE_ERRORS, then records one closing note and ignores the rest. */
export class ErrorList {
  private readonly items: ParseError[] = [];
  private isTruncated = false;

  /** Records an error; returns false once the list is full (callers may stop scanning). */
  add(line: number, column: number, message: string): boolean {
    if (this.isTruncated) return false;
    if (this.items.length >= MAX_PARSE_ERRORS) {
      this.items.push({ line, column, message: `more errors not shown (the first ${MAX_PARSE_ERRORS} are listed)` });
      this.isTruncated = true;
      return false;
    }
    this.items.push({ line, column, message });
    return true;
  }

  /** Whether any error was recorded. */
  get hasErrors(): boolean {
    return this.items.length > 0;
  }

  /** Whether the list is full and further errors are dropped. */
  get isFull(): boolean {
    return this.isTruncated;
  }

  /** The errors recorded so far, in the order found. */
  toArray(): readonly ParseError[] {
    return [...this.items];
  }
}

/** Formats an error as `file:line:column: message` (or `line L, column C: message` without a file). */
export function formatParseError(error: ParseError, file?: string): string {
  if (file !== undefined) return `${file}:${error.line}:${error.column}: ${error.message}`;
  if (error.line === 0) return error.message;
  return `line ${error.line}, column ${error.column}: ${error.message}`;
}

/** Shows one character for an error message: printable ASCII quoted, anything else as U+XXXX. */
export function describeChar(ch: string): string {
  const code = ch.codePointAt(0) ?? 0;
  if (code >= 0x21 && code <= 0x7e) return `'${ch}'`;
  const names: Record<number, string> = { 0x09: 'tab', 0x20: 'space', 0x0d: 'carriage return', 0xfeff: 'byte-order mark' };
  const hex = code.toString(16).toUpperCase().padStart(4, '0');
  return names[code] ? `U+${hex} (${names[code]})` : `U+${hex}`;
}
