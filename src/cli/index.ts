import { main } from './main';

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e) => {
    process.stderr.write(`hush: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = 1;
  },
);
