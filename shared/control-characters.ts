/**
 * The one definition of control characters in user text, zod-free so exporters and the web
 * bundle can use it: C0 controls (NUL to U+001F: PostgreSQL refuses NUL in text, and CR, LF and
 * tab end rows and lines in every export format), DEL, C1 controls (U+0080 to U+009F) and the
 * Unicode line and paragraph separators U+2028 and U+2029.
 */

/** The control characters as the body of a regular expression character class. */
const CONTROL = '\\u0000-\\u001F\\u007F-\\u009F\\u2028\\u2029';
/** The same without tab, line feed and carriage return, which multi-line text may hold. */
const CONTROL_BUT_LINE_BREAKS = '\\u0000-\\u0008\\u000B\\u000C\\u000E-\\u001F\\u007F-\\u009F\\u2028\\u2029';

/** Control characters, line breaks and tabs included (global: for replacing). */
export const CONTROL_CHARACTERS = new RegExp(`[${CONTROL}]`, 'g');

/** Text on one line: no control character, no line break, no tab. */
export const SINGLE_LINE_TEXT = new RegExp(`^[^${CONTROL}]*$`);

/** Text over several lines: no control character other than tab, line feed and carriage return. */
export const MULTI_LINE_TEXT = new RegExp(`^[^${CONTROL_BUT_LINE_BREAKS}]*$`);

/** `text` with every control character, tab and line break replaced by a space. */
export function foldControlCharacters(text: string): string {
  return text.replace(CONTROL_CHARACTERS, ' ');
}
