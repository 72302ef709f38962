/**
 * `npm run bench`: speed figures measured in one run, printed as ratios against
 * a native baseline or as goals met/missed. Not a test: nothing here fails the build.
 */
import { cpus } from 'os';
import { kernelBench } from './kernel-bench';
import { designBench } from './design-bench';
import { tmzBench } from './tmz-bench';
import { planBench } from './plan-bench';

const sections: [string, () => string[] | Promise<string[]>][] = [
  ['kernel', () => kernelBench(1)],
  ['tmz', () => tmzBench()],
  ['design', () => designBench()],
  ['plan', () => planBench()],
];

async function main() {
  console.log(`Hush benchmarks — ${new Date().toISOString().slice(0, 10)}, node ${process.version}, ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}`);
  const only = process.argv.slice(2);
  for (const [name, f] of sections) {
    if (only.length && !only.includes(name)) continue;
    for (const line of await f()) console.log(line);
  }
}
main();
