/**
 * A local stand-in for the workshop's mail server: an SMTP server on loopback (smtp-server) that accepts every
 * message and keeps it, in memory and as an .eml file, so the product can send real mail through nodemailer
 * without reaching the outside world.
 */
import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';

export interface CaughtMessage {
  id: number;
  from: string;
  to: string[];
  raw: string;
  receivedAt: Date;
}

export interface MailCatcher {
  port: number;
  url: string;
  messages: CaughtMessage[];
  stop(): Promise<void>;
}

export async function startMailCatcher(opts: { port?: number; dir?: string } = {}): Promise<MailCatcher> {
  const messages: CaughtMessage[] = [];
  if (opts.dir) fs.mkdirSync(opts.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const message: CaughtMessage = {
          id: messages.length + 1,
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map((r) => r.address),
          raw,
          receivedAt: new Date(),
        };
        messages.push(message);
        if (opts.dir) fs.writeFileSync(path.join(opts.dir, `${message.receivedAt.toISOString().replace(/[:.]/g, '-')}-${message.id}.eml`), raw);
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, '127.0.0.1', () => resolve());
  });
  const port = (server.server.address() as AddressInfo).port;
  return {
    port,
    url: `smtp://127.0.0.1:${port}`,
    messages,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
