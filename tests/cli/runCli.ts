import { spawn } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * Runs the real `rollway` as a child process. Asynchronous on purpose: the server under test runs
 * in this process, so a blocking spawnSync would stop it from answering.
 */

export const BIN = new URL('../../cli/bin.mjs', import.meta.url).pathname;

export interface CliRun { code: number | null; stdout: string; stderr: string }
export interface CliOptions {
  env?: Record<string, string | undefined>;
  /** All of stdin, then end of file. */
  input?: string;
  /** Typed once stdout shows `after` (a prompt); stdin then stays open, as a person's terminal does. */
  answer?: { after: RegExp; text: string };
  timeoutMs?: number;
}

/** A home of its own (config file in XDG_CONFIG_HOME), no ROLLWAY_* or colour settings from the outside. */
export function cliHome(): Record<string, string> {
  const home = mkdtempSync(join(tmpdir(), 'rollway-cli-'));
  return { HOME: home, XDG_CONFIG_HOME: join(home, 'config') };
}

function baseEnv(extra: Record<string, string | undefined>): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [key, value] of Object.entries(process.env)) {
    if (!/^(ROLLWAY_|NO_COLOR$|FORCE_COLOR$|XDG_CONFIG_HOME$)/.test(key)) env[key] = value;
  }
  for (const [key, value] of Object.entries(extra)) if (value !== undefined) env[key] = value;
  return env;
}

function runChild(command: string, args: string[], options: CliOptions): Promise<CliRun> {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { env: baseEnv(options.env ?? {}), stdio: ['pipe', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    let pending = options.answer;
    child.stdin.on('error', () => undefined); // the child may exit before reading it all
    child.stdout.setEncoding('utf8').on('data', (d: string) => {
      stdout += d;
      if (pending && pending.after.test(stdout)) {
        child.stdin.write(pending.text);
        pending = undefined;
      }
    });
    child.stderr.setEncoding('utf8').on('data', (d: string) => (stderr += d));
    const timer = setTimeout(() => child.kill('SIGKILL'), options.timeoutMs ?? 60_000);
    child.on('error', reject);
    child.on('close', (code) => {
      clearTimeout(timer);
      resolve({ code, stdout, stderr });
    });
    if (options.answer === undefined) child.stdin.end(options.input ?? '');
  });
}

export const rollway = (args: string[], options: CliOptions = {}): Promise<CliRun> => runChild(process.execPath, [BIN, ...args], options);

const shellQuote = (s: string): string => `'${s.replaceAll("'", "'\\''")}'`;

/** The CLI on a pseudo-terminal (util-linux `script`): stdout and stderr arrive together. */
export const rollwayOnTty = (args: string[], options: CliOptions = {}): Promise<CliRun> =>
  runChild('script', ['-qec', [process.execPath, BIN, ...args].map(shellQuote).join(' '), '/dev/null'], options);

/** A loopback port nobody listens on: bound once, then closed. */
export async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as { port: number };
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

/** RFC 4180 CSV (quoted fields, doubled quotes) as records, skipping the `#` provenance lines. */
export function parseCsv(text: string): Array<Record<string, string>> {
  const records: string[][] = [];
  let record: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i]!;
    if (quoted) {
      if (ch !== '"') field += ch;
      else if (text[i + 1] === '"') {
        field += '"';
        i++;
      } else quoted = false;
    } else if (ch === '"') {
      quoted = true;
    } else if (ch === ',' || ch === '\n') {
      record.push(field.replace(/\r$/, ''));
      field = '';
      if (ch === '\n') {
        records.push(record);
        record = [];
      }
    } else {
      field += ch;
    }
  }
  // The server quotes any field holding "#", so only a provenance line starts with one.
  const [header, ...rows] = records.filter((r) => !r[0]!.startsWith('#'));
  return rows.map((r) => Object.fromEntries(header!.map((name, i) => [name, r[i] ?? ''])));
}
