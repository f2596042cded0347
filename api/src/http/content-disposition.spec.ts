/** Content-Disposition of downloads: ASCII fallback and RFC 8187 filename* for any name. */
import { asciiFileName, attachmentDisposition, extendedFileName } from './content-disposition';

describe('attachmentDisposition', () => {
  it('sends a plain ASCII name once', () => {
    expect(attachmentDisposition('empty-8-8.map')).toBe('attachment; filename="empty-8-8.map"');
  });

  it('adds filename* when the name is not plain ASCII', () => {
    // RFC 8187 §3.2.1 example form: UTF-8, empty language, percent-encoded bytes.
    expect(attachmentDisposition('café.map')).toBe("attachment; filename=\"cafe.map\"; filename*=UTF-8''caf%C3%A9.map");
  });

  it('keeps quotes, backslashes, percent signs and line breaks out of the quoted fallback', () => {
    expect(asciiFileName('a"b\\c%d\r\ne.map')).toBe('a_b_c_d__e.map');
    expect(attachmentDisposition('a"b\r\n.map')).toBe("attachment; filename=\"a_b__.map\"; filename*=UTF-8''a%22b%0D%0A.map");
  });

  it('percent-encodes every character outside attr-char, and survives a lone surrogate', () => {
    expect(extendedFileName("x*'().map")).toBe("UTF-8''x%2A%27%28%29.map");
    expect(extendedFileName('!#$&+-.^_`|~')).toBe("UTF-8''!%23%24%26%2B-.%5E_%60%7C~");
    expect(extendedFileName('a\uD800b')).toBe("UTF-8''a%EF%BF%BDb");
  });
});
