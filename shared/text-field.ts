/**
 * The zod schemas of user-supplied text fields. Every name, description and search text of a
 * request uses one of them, so a NUL (which PostgreSQL refuses in text, answering 500) or another
 * control character is refused with 400 naming the field, and never reaches storage or exports.
 */
import { z } from 'zod';
import { MULTI_LINE_TEXT, SINGLE_LINE_TEXT } from './control-characters';

/** A one-line text field (names, versions, search text): trimmed, without control characters, line breaks or tabs. */
export function singleLineText(): z.ZodString {
  return z.string().trim().regex(SINGLE_LINE_TEXT, 'must not contain control characters, line breaks or tabs');
}

/** A multi-line text field (descriptions): trimmed, line breaks and tabs allowed, other control characters not. */
export function multiLineText(): z.ZodString {
  return z.string().trim().regex(MULTI_LINE_TEXT, 'must not contain control characters (line breaks and tabs are fine)');
}
