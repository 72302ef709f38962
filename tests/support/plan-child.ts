/**
 * Run in a child process (bundled by tests/support/bundle.ts): reads a table
 * (`read FILE [SHEET]`) or runs `hush ARGS…`, then prints one JSON line with
 * the result, the work counted by the reader, the CPU time of the call and
 * the process's peak resident memory, and whether exceljs was loaded.
 */
import { main } from '../../src/cli/main';
import { readTable, tableReadWork, type ReadStats } from '../../src/plan/table-file';

async function run(): Promise<void> {
  const [mode, ...args] = process.argv.slice(2);
  let stats: ReadStats = { bytesUnpacked: 0, rowsRead: 0, cellsRead: 0 };
  const out: string[] = [];
  const err: string[] = [];
  const t0 = process.cpuUsage();
  let code = 0;
  if (mode === 'read') {
    try {
      const t = await readTable(args[0], { sheet: args[1], stats });
      out.push(`rows ${t.rows.length}`);
    } catch (e) {
      code = 2;
      err.push(e instanceof Error ? e.message : String(e));
    }
  } else {
    code = await main([mode, ...args], { out: (t) => out.push(t), err: (t) => err.push(t), isTTY: false });
    stats = tableReadWork();
  }
  const d = process.cpuUsage(t0);
  const exceljs = Object.keys(require.cache).some((k) => /[\\/]node_modules[\\/]exceljs[\\/]/.test(k));
  process.stdout.write(
    JSON.stringify({ code, out, err, stats, cpuSeconds: (d.user + d.system) / 1e6, maxRssMiB: process.resourceUsage().maxRSS / 1024, exceljs }) + '\n',
  );
}

void run();
