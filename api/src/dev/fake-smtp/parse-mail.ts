/**
 * Just enough of Internet Message Format to show a received message: header fields (RFC 5322
 * §2.2, folded lines unfolded), RFC 2047 encoded words in the subject, and a quoted-printable or
 * base64 single-part body (RFC 2045 §6.7, §6.8) — what nodemailer sends for plain text.
 */

/** The parts of a message the mailbox shows. */
export interface ParsedMail {
  readonly from: string;
  readonly subject: string;
  readonly text: string;
}

function decodeQuotedPrintable(s: string): string {
  const bytes: number[] = [];
  const soft = s.replace(/=\r?\n/g, '');
  for (let i = 0; i < soft.length; i++) {
    if (soft[i] === '=' && /^[0-9A-Fa-f]{2}$/.test(soft.slice(i + 1, i + 3))) {
      bytes.push(parseInt(soft.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      bytes.push(...Buffer.from(soft[i], 'utf8'));
    }
  }
  return Buffer.from(bytes).toString('utf8');
}

function decodeWords(s: string): string {
  // Whitespace between two adjacent encoded words is not part of the text (RFC 2047 §6.2).
  return s.replace(/(\?=)\s+(?==\?)/g, '$1').replace(/=\?([^?]+)\?([QqBb])\?([^?]*)\?=/g, (_m, _cs: string, enc: string, data: string) =>
    enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64').toString('utf8') : decodeQuotedPrintable(data.replace(/_/g, ' ')));
}

/** Parses a raw message. */
export function parseMail(raw: string): ParsedMail {
  const split = raw.search(/\r?\n\r?\n/);
  const head = split < 0 ? raw : raw.slice(0, split);
  const body = split < 0 ? '' : raw.slice(split).replace(/^\r?\n\r?\n/, '');
  const headers = new Map<string, string>();
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':');
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
  }
  const encoding = (headers.get('content-transfer-encoding') ?? '7bit').toLowerCase();
  const text = encoding === 'quoted-printable' ? decodeQuotedPrintable(body)
    : encoding === 'base64' ? Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8') : body;
  return { from: decodeWords(headers.get('from') ?? ''), subject: decodeWords(headers.get('subject') ?? ''), text: text.replace(/\r\n/g, '\n').trimEnd() };
}
