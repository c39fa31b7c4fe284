import nodemailer from 'nodemailer';
import type { Env } from '../env.js';

/** Sends one plain-text mail from the configured sender; resolves with the server's message id. */
export interface Mailer {
  send(mail: { to: string; subject: string; text: string }): Promise<{ messageId: string | null }>;
}

/** A mailer over SMTP from the SMTP_* configuration, or null when no SMTP host is configured. */
export function createMailer(env: Env): Mailer | null {
  if (!env.SMTP_HOST || !env.SMTP_PORT) return null;
  const secure = env.SMTP_SECURE === 'true';
  const transport = nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure,
    // Plain loopback servers (the local stand-in) offer no TLS; a real relay on 587 upgrades with STARTTLS.
    ignoreTLS: !secure && env.SMTP_HOST === '127.0.0.1',
    auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? '' } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  });
  return {
    async send(mail) {
      const info = await transport.sendMail({ from: env.MAIL_FROM, ...mail });
      return { messageId: info.messageId ?? null };
    },
  };
}
