import { InvalidInputError, RollwayError } from '../shared/errors.ts';

/** The whole of stdin, less one trailing line end (`echo secret | rollway login … --password-stdin`). */
export async function readStdin(what: string): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  const text = Buffer.concat(chunks).toString('utf8').replace(/\r?\n$/, '');
  if (text === '') throw new InvalidInputError(`${what}: stdin was empty`, what);
  return text;
}

/** Asks on the terminal without echoing what is typed (raw mode: we see every key, print none). */
export async function askHidden(prompt: string): Promise<string> {
  const stdin = process.stdin;
  if (!stdin.isTTY) throw new InvalidInputError('no terminal to ask for the password on: pipe it in with --password-stdin', '--password-stdin');
  // Echo goes off before the prompt shows, so nothing typed after it can appear.
  stdin.setRawMode(true);
  process.stderr.write(prompt);
  stdin.setEncoding('utf8');
  stdin.resume();
  return new Promise((resolve, reject) => {
    let value = '';
    const finish = () => {
      stdin.off('data', onData);
      stdin.setRawMode(false);
      stdin.pause();
      process.stderr.write('\n');
    };
    const onData = (text: string) => {
      for (const ch of text) {
        if (ch === '\r' || ch === '\n') {
          finish();
          resolve(value);
          return;
        }
        if (ch === '\u0003' || ch === '\u0004') {
          finish();
          reject(new RollwayError('interrupted', 'interrupted; nothing was changed', 499));
          return;
        }
        if (ch === '\u007f' || ch === '\b') value = value.slice(0, -1);
        else if (ch >= ' ') value += ch;
      }
    };
    stdin.on('data', onData);
  });
}
