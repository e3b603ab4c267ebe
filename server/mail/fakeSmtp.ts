import { randomUUID } from 'node:crypto';
import { mkdir, writeFile } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';

/**
 * A development and test mail server that speaks real SMTP: it accepts any sender, recipient and
 * credentials, parses each message and keeps it in memory and, with `dir`, as an .eml file a
 * developer can open. It accepts any password, so it only ever listens on loopback.
 */
export interface ReceivedMail {
  /** What the client said in MAIL FROM and RCPT TO. */
  envelope: { from: string; to: string[] };
  /** The user the client authenticated as, if it did. */
  user?: string;
  /** The From header. */
  from: { name: string; address: string };
  /** Addresses of the To header. */
  to: string[];
  subject: string;
  text: string;
  html: string;
  raw: string;
  receivedAt: Date;
  /** The .eml file, when the server keeps a folder. */
  file?: string;
}

export interface FakeSmtp {
  host: string;
  port: number;
  messages(): Promise<ReceivedMail[]>;
  /** The first message, received or still to come, that matches; rejects after timeoutMs. */
  waitFor(predicate: (mail: ReceivedMail) => boolean, timeoutMs?: number): Promise<ReceivedMail>;
  close(): Promise<void>;
}

export interface FakeSmtpOptions {
  host?: string;
  port?: number;
  dir?: string;
}

/** A development server may run for days; the folder keeps everything, memory the latest. */
const KEPT_IN_MEMORY = 1000;
const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

function isLoopback(host: string): boolean {
  return host === 'localhost' || host === '::1' || /^127\.\d+\.\d+\.\d+$/.test(host);
}

function addresses(header: AddressObject | AddressObject[] | undefined): string[] {
  const objects = header === undefined ? [] : Array.isArray(header) ? header : [header];
  return objects.flatMap((o) => o.value.map((a) => a.address ?? '')).filter((a) => a !== '');
}

function readAll(stream: SMTPServerDataStream): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    stream.on('data', (chunk: Buffer) => chunks.push(chunk));
    stream.once('error', reject);
    stream.once('end', () => resolve(Buffer.concat(chunks)));
  });
}

function fileName(receivedAt: Date): string {
  return `${receivedAt.toISOString().replace(/[:.]/g, '-')}-${randomUUID().slice(0, 8)}.eml`;
}

export async function startFakeSmtp(options: FakeSmtpOptions = {}): Promise<FakeSmtp> {
  const host = options.host ?? '127.0.0.1';
  if (!isLoopback(host)) throw new Error(`the fake SMTP server accepts any password, so it only listens on loopback, not ${host}`);
  const { dir } = options;
  if (dir !== undefined) await mkdir(dir, { recursive: true });

  const received: ReceivedMail[] = [];
  const waiters = new Set<{ predicate: (mail: ReceivedMail) => boolean; resolve: (mail: ReceivedMail) => void; reject: (error: Error) => void }>();

  async function store(raw: Buffer, session: SMTPServerSession): Promise<void> {
    const parsed = await simpleParser(raw);
    const receivedAt = new Date();
    const file = dir === undefined ? undefined : join(dir, fileName(receivedAt));
    if (file !== undefined) await writeFile(file, raw);
    const mail: ReceivedMail = {
      envelope: {
        from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
        to: session.envelope.rcptTo.map((r) => r.address),
      },
      ...(typeof session.user === 'string' ? { user: session.user } : {}),
      from: { name: parsed.from?.value[0]?.name ?? '', address: parsed.from?.value[0]?.address ?? '' },
      to: addresses(parsed.to),
      subject: parsed.subject ?? '',
      text: parsed.text ?? '',
      html: parsed.html || '',
      raw: raw.toString('utf8'),
      receivedAt,
      ...(file === undefined ? {} : { file }),
    };
    received.push(mail);
    if (received.length > KEPT_IN_MEMORY) received.shift();
    for (const waiter of waiters) {
      if (waiter.predicate(mail)) {
        waiters.delete(waiter);
        waiter.resolve(mail);
      }
    }
  }

  const server = new SMTPServer({
    name: 'localhost',
    banner: 'Rollway development mail server: nothing is delivered',
    logger: false,
    disableReverseLookup: true,
    // No TLS: clients would have to trust a self-signed certificate, and the traffic stays on loopback.
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    allowInsecureAuth: true,
    size: MAX_MESSAGE_BYTES,
    closeTimeout: 1000,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username ?? 'anyone' });
    },
    onData(stream, session, callback) {
      readAll(stream)
        .then((raw) => {
          if (stream.sizeExceeded) throw Object.assign(new Error('message too large'), { responseCode: 552 });
          return store(raw, session);
        })
        .then(
          () => callback(),
          (error: Error & { responseCode?: number }) => callback(Object.assign(error, { responseCode: error.responseCode ?? 451 })),
        );
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const port = (server.server.address() as AddressInfo).port;

  return {
    host,
    port,
    async messages() {
      return [...received];
    },
    waitFor(predicate, timeoutMs = 5000) {
      const found = received.find(predicate);
      if (found) return Promise.resolve(found);
      return new Promise<ReceivedMail>((resolve, reject) => {
        const timer = setTimeout(() => {
          waiters.delete(waiter);
          const subjects = received.map((m) => `"${m.subject}" to ${m.envelope.to.join(', ')}`).join('; ') || 'none';
          reject(new Error(`no matching mail within ${timeoutMs} ms (received: ${subjects})`));
        }, timeoutMs);
        const settle = <T>(finish: (value: T) => void) => (value: T) => {
          clearTimeout(timer);
          finish(value);
        };
        const waiter = { predicate, resolve: settle(resolve), reject: settle(reject) };
        waiters.add(waiter);
      });
    },
    close() {
      for (const waiter of waiters) waiter.reject(new Error('the fake SMTP server was closed'));
      waiters.clear();
      return new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
