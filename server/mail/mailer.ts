import nodemailer from 'nodemailer';
import type { Logger } from 'pino';
import type { MailConfig } from './mailConfig.ts';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  close(): Promise<void>;
  readonly kind: 'smtp' | 'fake' | 'off';
}

/** One plain address: a comma or angle bracket would let one `to` reach several people. */
const SINGLE_ADDRESS = /^[^\s@<>,;"]+@[^\s@<>,;"]+$/;

function checkRecipient(to: string): void {
  if (!SINGLE_ADDRESS.test(to)) throw new Error(`mail recipient must be one plain address, got ${JSON.stringify(to)}`);
}

/** The SMTP URL for logs, without its credentials. */
function withoutCredentials(smtpUrl: string): string {
  const url = new URL(smtpUrl);
  return `${url.protocol}//${url.host}`;
}

// A mail is sent while someone waits for an answer (an invitation, a reset); nodemailer's
// defaults would let an unreachable server hold that request for minutes.
const TIMEOUTS = { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 };

function smtpMailer(kind: 'smtp' | 'fake', url: string, from: string, log: Logger): Mailer {
  const transport = nodemailer.createTransport({ url, ...TIMEOUTS });
  return {
    kind,
    async send(mail) {
      checkRecipient(mail.to);
      try {
        const info = await transport.sendMail({ from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
        log.debug({ to: mail.to, subject: mail.subject, messageId: info.messageId }, 'mail sent');
      } catch (error) {
        log.warn({ to: mail.to, subject: mail.subject, err: error }, 'mail not sent');
        throw error;
      }
    },
    async close() {
      transport.close();
    },
  };
}

/**
 * The mailer the settings ask for. `fake` starts the development SMTP server on a free loopback
 * port (loaded only then: it needs the mail parser, which production does not).
 */
export async function createMailer(config: MailConfig, logger: Logger): Promise<Mailer> {
  const log = logger.child({ component: 'mail' });
  if (config.mode === 'off') {
    log.info('mail is off (ROLLWAY_MAIL=off): nothing will be sent');
    return {
      kind: 'off',
      async send(mail) {
        checkRecipient(mail.to);
        log.debug({ to: mail.to, subject: mail.subject }, 'mail is off (ROLLWAY_MAIL=off): not sent');
      },
      async close() {},
    };
  }
  if (config.mode === 'smtp') {
    log.info({ server: withoutCredentials(config.smtpUrl) }, 'mail goes out through SMTP');
    return smtpMailer('smtp', config.smtpUrl, config.from, log);
  }
  const { startFakeSmtp } = await import('./fakeSmtp.ts');
  const fake = await startFakeSmtp(config.dir === undefined ? {} : { dir: config.dir });
  log.info(
    { port: fake.port, dir: config.dir ?? null },
    config.dir === undefined
      ? `mail is not delivered: a development SMTP server on ${fake.host}:${fake.port} keeps it in memory (set SMTP_URL to deliver)`
      : `mail is not delivered: a development SMTP server on ${fake.host}:${fake.port} saves each message in ${config.dir} (set SMTP_URL to deliver)`,
  );
  const inner = smtpMailer('fake', `smtp://${fake.host}:${fake.port}`, config.from, log);
  return {
    kind: 'fake',
    send: inner.send,
    async close() {
      await inner.close();
      await fake.close();
    },
  };
}
