/**
 * What the CLI draws on a terminal and nowhere else: colours (only on a TTY, never with
 * NO_COLOR or TERM=dumb, https://no-color.org) and a one-line progress bar redrawn in place.
 */

type Stream = { isTTY?: boolean };

export function colourOn(stream: Stream = process.stdout, env: NodeJS.ProcessEnv = process.env): boolean {
  return stream.isTTY === true && !env.NO_COLOR && env.TERM !== 'dumb';
}

const CODES = { red: 31, green: 32, yellow: 33, cyan: 36, dim: 2, bold: 1 } as const;
export type Colour = keyof typeof CODES;

/** A painter for one stream: returns the text unchanged when colours are off. */
export function painter(stream: Stream = process.stdout): (colour: Colour, text: string) => string {
  const on = colourOn(stream);
  return (colour, text) => (on ? `\x1b[${CODES[colour]}m${text}\x1b[0m` : text);
}

export const STATE_COLOURS: Record<string, Colour> = { queued: 'dim', running: 'cyan', completed: 'green', cancelled: 'yellow', failed: 'red' };

/** Visible width of a text that may hold colour codes. */
export const visibleLength = (text: string): number => text.replace(/\x1b\[[0-9;]*m/g, '').length;

export function formatDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return '—';
  const s = Math.max(0, Math.round(seconds));
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const pad = (n: number) => String(n).padStart(2, '0');
  return h > 0 ? `${h}:${pad(m)}:${pad(s % 60)}` : `${m}:${pad(s % 60)}`;
}

export const count = (n: number): string => n.toLocaleString('en-US');

export function bar(fraction: number, width = 24): string {
  const filled = Math.round(Math.min(1, Math.max(0, fraction)) * width);
  return `${'█'.repeat(filled)}${'░'.repeat(width - filled)}`;
}

/** A line redrawn in place on a TTY stream; does nothing on a pipe or file, so logs stay clean. */
export function liveLine(stream: NodeJS.WriteStream = process.stderr) {
  const on = stream.isTTY === true;
  let drawn = false;
  return {
    on,
    draw(text: string): void {
      if (!on) return;
      stream.write(`\r\x1b[2K${text}`);
      drawn = true;
    },
    /** Leaves the last drawing on screen and moves to a fresh line. */
    done(): void {
      if (drawn) stream.write('\n');
      drawn = false;
    },
  };
}
