/**
 * Shortens a long map or scenario name in the middle. Names of one family share their start
 * ("warehouse-large-…") and differ at the end (a number, a variant), so the end is the part a
 * reader needs: it keeps more of the end than of the start. Show the full name on hover beside it.
 */

/** The ellipsis character put in place of the cut middle. */
export const ELLIPSIS = '…';

/** `text` as it is when it has at most `maxChars` characters, else its start + '…' + its longer end, `maxChars` long in all. */
export function middleEllipsis(text: string, maxChars: number): string {
  const chars = [...text]; // by code point, so no surrogate pair is cut in two
  if (chars.length <= maxChars) return text;
  const kept = Math.max(1, maxChars - 1);
  const head = Math.floor(kept * 0.4);
  const tail = kept - head;
  return chars.slice(0, head).join('') + ELLIPSIS + chars.slice(chars.length - tail).join('');
}

/**
 * Grid column settings showing a name cut in the middle with the full name as its tooltip
 * (AG Grid's TooltipModule must be registered). Sorting and filtering still use the full value.
 */
export function middleEllipsisCell(maxChars: number): {
  valueFormatter: (p: { value?: unknown }) => string;
  tooltipValueGetter: (p: { value?: unknown }) => string | undefined;
} {
  return {
    valueFormatter: (p) => (typeof p.value === 'string' ? middleEllipsis(p.value, maxChars) : p.value == null ? '' : String(p.value)),
    tooltipValueGetter: (p) => (typeof p.value === 'string' && [...p.value].length > maxChars ? p.value : undefined),
  };
}
