/** Output sink of a command, so commands can be run in-process by tests. */
export interface CommandIO {
  out(text: string): void;
  err(text: string): void;
  /** True when standard output is a terminal (progress bars only then). */
  isTTY: boolean;
}

export const processIO: CommandIO = {
  out: (t) => process.stdout.write(t.endsWith('\n') ? t : t + '\n'),
  err: (t) => process.stderr.write(t.endsWith('\n') ? t : t + '\n'),
  isTTY: Boolean(process.stdout.isTTY),
};

/** Pretty number for terminal tables: 4 significant digits, exponent when small or large. */
export function fmt(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a < 1e-3 || a >= 1e6) return x.toExponential(digits - 1);
  return Number(x.toPrecision(digits)).toString();
}

/** A reflection in dB for a terminal: 4 significant digits, or "no dB value" for |r| = 0. */
export function fmtDb(db: number | null): string {
  return db === null ? 'no dB value (|r| = 0)' : `${fmt(db)} dB`;
}

/** An error message as one line of stderr: line breaks inside it (from text the user typed) are shown escaped. */
export function oneLine(message: string): string {
  return message.replace(/\r/g, '\\r').replace(/\n/g, '\\n');
}
