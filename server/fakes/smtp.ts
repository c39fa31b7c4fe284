import express from 'express';
import type { Server } from 'node:http';
import { SMTPServer } from 'smtp-server';

/** One message as the local SMTP stand-in received it. */
export interface ReceivedMail {
  id: number;
  from: string;
  to: string[];
  subject: string;
  text: string;
  receivedAt: string;
}

function decodeQuotedPrintable(s: string): string {
  const bytes: number[] = [];
  const soft = s.replace(/=\r?\n/g, '');
  for (let i = 0; i < soft.length; i++) {
    if (soft[i] === '=' && /^[0-9A-F]{2}$/i.test(soft.slice(i + 1, i + 3))) {
      bytes.push(parseInt(soft.slice(i + 1, i + 3), 16));
      i += 2;
    } else bytes.push(...Buffer.from(soft[i], 'utf8'));
  }
  return Buffer.from(bytes).toString('utf8');
}

function decodeHeader(v: string): string {
  return v.replace(/=\?utf-8\?([QB])\?([^?]*)\?=/gi, (_m, enc: string, text: string) =>
    enc.toUpperCase() === 'B' ? Buffer.from(text, 'base64').toString('utf8') : decodeQuotedPrintable(text.replace(/_/g, ' ')),
  );
}

/** Enough MIME for the plain-text mails the app sends (nodemailer: 7bit, quoted-printable or base64). */
export function parseMessage(raw: string): { subject: string; text: string } {
  const split = raw.search(/\r?\n\r?\n/);
  const head = split >= 0 ? raw.slice(0, split) : raw;
  const body = split >= 0 ? raw.slice(split).replace(/^\r?\n\r?\n/, '') : '';
  const headers = new Map<string, string>();
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const i = line.indexOf(':');
    if (i > 0) headers.set(line.slice(0, i).trim().toLowerCase(), line.slice(i + 1).trim());
  }
  const encoding = (headers.get('content-transfer-encoding') ?? '').toLowerCase();
  const text = encoding === 'quoted-printable' ? decodeQuotedPrintable(body) : encoding === 'base64' ? Buffer.from(body, 'base64').toString('utf8') : body;
  return { subject: decodeHeader(headers.get('subject') ?? ''), text: text.replace(/\r\n/g, '\n').trimEnd() };
}

/**
 * A loopback stand-in for a mail relay: smtp-server keeps every message in memory, and a small HTTP JSON
 * mailbox lists them (GET /messages, GET /messages/:id, DELETE /messages). Recipients whose local part
 * starts with "refuse-" get a temporary 451, so retries can be seen.
 */
export async function startFakeSmtp(smtpPort: number, mailboxPort: number): Promise<{ smtp: SMTPServer; mailbox: Server; messages: ReceivedMail[] }> {
  const messages: ReceivedMail[] = [];
  let nextId = 1;
  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onRcptTo(address, _session, callback) {
      if (/^refuse-/i.test(address.address)) {
        const err = Object.assign(new Error('Mailbox temporarily unavailable'), { responseCode: 451 });
        return callback(err);
      }
      callback();
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const { subject, text } = parseMessage(Buffer.concat(chunks).toString('utf8'));
        messages.push({
          id: nextId++,
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map((r) => r.address),
          subject,
          text,
          receivedAt: new Date().toISOString(),
        });
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    smtp.once('error', reject);
    smtp.listen(smtpPort, '127.0.0.1', () => resolve());
  });

  const app = express();
  app.get('/health', (_req, res) => {
    res.json({ status: 'ok' });
  });
  app.get('/messages', (req, res) => {
    const to = typeof req.query.to === 'string' ? req.query.to.toLowerCase() : undefined;
    const list = to ? messages.filter((m) => m.to.some((a) => a.toLowerCase() === to)) : messages;
    res.json({ messages: [...list].reverse(), total: list.length });
  });
  app.get('/messages/:id', (req, res) => {
    const m = messages.find((x) => x.id === Number(req.params.id));
    if (!m) {
      res.status(404).json({ error: 'no such message' });
      return;
    }
    res.json({ message: m });
  });
  app.delete('/messages', (_req, res) => {
    messages.length = 0;
    res.status(204).end();
  });
  const mailbox = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(mailboxPort, '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  return { smtp, mailbox, messages };
}
