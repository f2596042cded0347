/**
 * The Content-Disposition of every download. A header may only carry Latin-1 (Node throws on
 * anything above U+00FF, which answered `地图.map` with 500) and browsers disagree on how they read
 * bytes above ASCII, so the name is sent as RFC 6266 advises (§4.3, Appendix D): `filename` with an ASCII
 * fallback for old clients, and `filename*` (RFC 8187, which replaced RFC 5987) with the UTF-8
 * name percent-encoded, which current browsers prefer.
 */

/** Unpaired UTF-16 surrogates, which have no UTF-8 form (encodeURIComponent throws on them). */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/**
 * `name` in printable ASCII for the `filename` parameter: accents dropped (é → e), and every
 * other character a quoted-string cannot carry plainly (RFC 9110 §5.6.4: `"`, `\`, controls),
 * `%` (RFC 6266 §4.3: some clients percent-decode `filename`) and non-ASCII replaced by `_`.
 */
export function asciiFileName(name: string): string {
  return name.normalize('NFKD').replace(/[\u0300-\u036F]/g, '').replace(/[^\x20-\x7E]|["\\%]/g, '_');
}

/**
 * `name` as an RFC 8187 ext-value: UTF-8, every byte outside attr-char (RFC 8187 §3.2.1: letters,
 * digits and ! # $ & + - . ^ _ ` | ~) percent-encoded. encodeURIComponent leaves only * ' ( ) of
 * the other characters plain, so those are encoded here.
 */
export function extendedFileName(name: string): string {
  const encoded = encodeURIComponent(name.replace(LONE_SURROGATE, '\uFFFD'))
    .replace(/[*'()]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `UTF-8''${encoded}`;
}

/**
 * `attachment; filename="…"`, plus `filename*=UTF-8''…` whenever the ASCII fallback is not the
 * name itself (a plain ASCII name needs no second spelling).
 */
export function attachmentDisposition(name: string): string {
  const fallback = asciiFileName(name);
  const plain = `attachment; filename="${fallback}"`;
  return fallback === name ? plain : `${plain}; filename*=${extendedFileName(name)}`;
}
