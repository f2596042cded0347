/**
 * The local fake SMTP server of development and tests (smtp-server): accepts every message on
 * 127.0.0.1 without TLS or authentication and keeps it in a Mailbox instead of delivering it.
 * Never for production: `npm start` runs it only when SMTP_URL is unset.
 */
import { SMTPServer } from 'smtp-server';
import type { AddressInfo } from 'node:net';
import { Mailbox } from './mailbox';
import { parseMail } from './parse-mail';

/** A running fake SMTP server. */
export interface RunningFakeSmtp {
  readonly port: number;
  /** `smtp://127.0.0.1:PORT`, for SMTP_URL. */
  readonly url: string;
  readonly mailbox: Mailbox;
  close(): Promise<void>;
}

/** Starts the server on 127.0.0.1:`port` (0 = a free port). */
export async function startFakeSmtp(port: number, mailbox = new Mailbox()): Promise<RunningFakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const parsed = parseMail(Buffer.concat(chunks).toString('utf8'));
        mailbox.add({
          receivedAt: new Date().toISOString(),
          from: parsed.from || (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: parsed.subject,
          text: parsed.text,
        });
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const actual = (server.server.address() as AddressInfo).port;
  return {
    port: actual,
    url: `smtp://127.0.0.1:${actual}`,
    mailbox,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
