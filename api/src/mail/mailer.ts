/** Outgoing e-mail through nodemailer on SMTP_URL (the local fake SMTP server in development and tests). */
import nodemailer from 'nodemailer';

/** One message to send. */
export interface MailMessage {
  readonly to: string;
  readonly subject: string;
  readonly text: string;
}

/** Sends e-mail. */
export interface Mailer {
  send(message: MailMessage): Promise<void>;
  close(): void;
}

/** The sender address of every Quarterturn message. */
export const MAIL_FROM = 'Quarterturn <noreply@quarterturn.invalid>';

/**
 * A mailer on `smtpUrl` (`smtp://host:port` or `smtps://…`). Plain `smtp:` never upgrades to
 * TLS: the local fake server offers none, and a real relay is expected to use `smtps:`.
 */
export function createMailer(smtpUrl: string): Mailer {
  const url = new URL(smtpUrl);
  const isTls = url.protocol === 'smtps:';
  const transport = nodemailer.createTransport({
    host: url.hostname,
    port: Number(url.port || (isTls ? 465 : 25)),
    secure: isTls,
    ignoreTLS: !isTls,
    ...(url.username ? { auth: { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } } : {}),
  });
  return {
    async send(message) {
      await transport.sendMail({ from: MAIL_FROM, ...message });
    },
    close() {
      transport.close();
    },
  };
}
