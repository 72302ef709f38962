/**
 * One production build of the add-in (webpack.config.js) for all the tests
 * that need it (tests/build.test.ts, tests/browser-taskpane.test.ts): built
 * into dist/web only when something it is made from is newer than the last
 * build, under a lock so that two test files running at the same time build
 * it once. A webpack build costs about 20 s of CPU on a 2-core machine.
 */
import { spawnSync } from 'child_process';
import * as fs from 'fs';
import * as path from 'path';

export const ROOT = path.resolve(__dirname, '..', '..');
/** Where the build goes (the same folder `npm run build:web` writes). */
export const WEB_DIST = path.join(ROOT, 'dist', 'web');
const STAMP = path.join(WEB_DIST, '.built-from');
const LOCK = path.join(ROOT, 'dist', '.web-build.lock');

/** Folders and files the bundles are made from. */
const INPUTS = ['taskpane', 'src', 'assets', 'webpack.config.js', 'tsconfig.json', 'manifest.xml', 'package.json', 'package-lock.json'];

function newestInput(): number {
  let newest = 0;
  const walk = (p: string) => {
    const s = fs.statSync(p, { throwIfNoEntry: false });
    if (!s) return;
    if (s.isDirectory()) for (const e of fs.readdirSync(p)) walk(path.join(p, e));
    else newest = Math.max(newest, s.mtimeMs);
  };
  for (const i of INPUTS) walk(path.join(ROOT, i));
  return newest;
}

/** True when dist/web was built (by this module) after the last change to its inputs. */
function upToDate(): boolean {
  const s = fs.statSync(STAMP, { throwIfNoEntry: false });
  return s !== undefined && Number(fs.readFileSync(STAMP, 'utf8')) >= newestInput();
}

function sleep(ms: number): void {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Takes the build lock, waiting while another live process holds it; a lock left by a dead process is taken over. */
function lock(): void {
  fs.mkdirSync(path.dirname(LOCK), { recursive: true });
  for (;;) {
    try {
      fs.mkdirSync(LOCK);
      fs.writeFileSync(path.join(LOCK, 'pid'), String(process.pid));
      return;
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
    }
    let owner = 0;
    try {
      owner = Number(fs.readFileSync(path.join(LOCK, 'pid'), 'utf8')) || 0;
    } catch {
      // the holder has not written its pid yet, or has just let go
    }
    if (owner > 0 && !alive(owner)) fs.rmSync(LOCK, { recursive: true, force: true });
    else sleep(200);
  }
}

/** Builds dist/web unless it is up to date; returns its path. */
export function webBuild(): string {
  if (upToDate()) return WEB_DIST;
  lock();
  try {
    if (upToDate()) return WEB_DIST; // built by the test file that held the lock
    const started = newestInput();
    const cli = path.join(ROOT, 'node_modules', 'webpack-cli', 'bin', 'cli.js');
    const r = spawnSync(process.execPath, [cli, '--mode', 'production'], { cwd: ROOT, encoding: 'utf8', env: { ...process.env, NO_COLOR: '1' } });
    if (r.status !== 0) throw new Error(`webpack failed (${r.status}):\n${r.stdout}\n${r.stderr}`);
    fs.writeFileSync(STAMP, String(started));
  } finally {
    fs.rmSync(LOCK, { recursive: true, force: true });
  }
  return WEB_DIST;
}

/** The scripts a page loads from its own origin, in order: the `src` of each <script> that is not an absolute URL. */
export function pageScripts(html: string): string[] {
  return [...html.matchAll(/<script\b[^>]*\bsrc="?([^"\s>]+)"?[^>]*>/g)].map((m) => m[1]).filter((src) => !/^[a-z]+:\/\//i.test(src));
}
