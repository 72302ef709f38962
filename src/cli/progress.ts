/** A progress bar on standard error, drawn only when standard error is a terminal. */
import { processIO, type CommandIO } from './io';

/**
 * A function to call with the work done so far and the total, or null when
 * standard error is not a terminal (no bar in logs or pipes). `label` says
 * what follows the bar (default "done/total"); the line is redrawn only when
 * its text changes, and ends with a line break when done reaches total.
 */
export function progressBar(io: CommandIO, label: (done: number, total: number) => string = (d, t) => `${d}/${t}`): ((done: number, total: number) => void) | null {
  const tty = io === processIO ? Boolean(process.stderr.isTTY) : io.isTTY;
  if (!tty) return null;
  const write = io === processIO ? (t: string) => process.stderr.write(t) : (t: string) => io.err(t);
  let last = '';
  return (done, total) => {
    const width = 30;
    const filled = Math.max(0, Math.min(width, Math.round((width * done) / total)));
    const line = `\r[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${label(done, total)}${done >= total ? '\n' : ''}`;
    if (line === last) return;
    last = line;
    write(line);
  };
}
