import { availableParallelism } from 'node:os';
import { z } from 'zod';
import { mailEnvShape, toMailConfig, type MailConfig } from './mail/mailConfig.ts';

/**
 * The only place that reads process.env. Every variable is listed in .env.example; a bad value
 * stops the server at start with the variable's name.
 */
const schema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(4600),
  HOST: z.string().min(1).default('127.0.0.1'),
  DATA_DIR: z.string().min(1).default('./data'),
  DATABASE_URL: z.string().url().optional(),
  ROLLWAY_WORKERS: z.coerce.number().int().min(1).max(256).default(availableParallelism()),
  ROLLWAY_BATCH_SIZE: z.coerce.number().int().min(1).max(10_000).default(500),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  ...mailEnvShape,
});

export interface Config {
  port: number;
  host: string;
  dataDir: string;
  databaseUrl?: string;
  workers: number;
  batchSize: number;
  logLevel: string;
  mail: MailConfig;
}

export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const parsed = schema.safeParse(env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`invalid environment: ${problems}`);
  }
  const e = parsed.data;
  return {
    port: e.PORT,
    host: e.HOST,
    dataDir: e.DATA_DIR,
    ...(e.DATABASE_URL === undefined ? {} : { databaseUrl: e.DATABASE_URL }),
    workers: e.ROLLWAY_WORKERS,
    batchSize: e.ROLLWAY_BATCH_SIZE,
    logLevel: e.LOG_LEVEL,
    mail: toMailConfig(e, { host: e.HOST, port: e.PORT, dataDir: e.DATA_DIR }),
  };
}
