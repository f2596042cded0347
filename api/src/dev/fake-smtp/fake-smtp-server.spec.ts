import { createMailer } from '../../mail/mailer';
import { parseMail } from './parse-mail';
import { startFakeSmtp, type RunningFakeSmtp } from './fake-smtp-server';

describe('fake SMTP server', () => {
  let smtp: RunningFakeSmtp;
  beforeAll(async () => {
    smtp = await startFakeSmtp(0);
  });
  afterAll(async () => {
    await smtp.close();
  });

  it('receives what nodemailer sends, non-ASCII text included', async () => {
    const mailer = createMailer(smtp.url);
    await mailer.send({ to: 'ada@example.test', subject: 'Sweep "depot" finished', text: 'Runs: 4\nFörderband → Gang 3' });
    mailer.close();
    const got = await smtp.mailbox.waitFor((m) => m.to.includes('ada@example.test'));
    expect(got.subject).toBe('Sweep "depot" finished');
    expect(got.text).toBe('Runs: 4\nFörderband → Gang 3');
    expect(got.from).toMatch(/noreply@quarterturn\.invalid/);
  });

  it('decodes a quoted-printable body with soft line breaks and an encoded-word subject', () => {
    // Worked example after RFC 2045 §6.7 (=C3=BC is "ü" in UTF-8; "=" at line end is a soft break) and RFC 2047 §8.
    const raw = 'From: a@b\r\nSubject: =?UTF-8?Q?Gr=C3=BC=C3=9Fe?=\r\nContent-Transfer-Encoding: quoted-printable\r\n\r\nT=C3=BCr zu=\r\n zu\r\n';
    expect(parseMail(raw)).toEqual({ from: 'a@b', subject: 'Grüße', text: 'Tür zu zu' });
    // RFC 2047 §8: "(=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=)" displays as "(ab)".
    expect(parseMail('Subject: (=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=)\r\n\r\n').subject).toBe('(ab)');
  });
});
