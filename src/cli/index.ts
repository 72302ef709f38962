import { main } from './main';

// A reader that closes the pipe early (`hush … | head`) ends the output, not the process with a stack trace.
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw e;
  });
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e) => {
    process.stderr.write(`hush: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = 1;
  },
);
