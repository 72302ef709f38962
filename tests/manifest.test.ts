/**
 * manifest.xml: parses with the Office manifest tool (offline `info`; the
 * networked `validate` is `npm run validate`), and declares what the shared
 * runtime needs — the SharedRuntime and CustomFunctionsRuntime requirement
 * sets, one long-lived runtime on taskpane.html that is also the functions'
 * page and the ribbon's function file, the HUSH namespace — with every
 * resource id resolved and every icon present at the size it claims.
 * Expected structure: "Configure your Office Add-in to use a shared runtime"
 * (Microsoft Learn, Office Add-ins documentation, add-in only manifest tab).
 */
import { spawnSync } from 'child_process';
import { readFileSync } from 'fs';
import { createRequire } from 'module';
import path from 'path';
import { beforeAll, describe, expect, it } from 'vitest';
import { APP_VERSION } from '../src/plan/version';

const requireHere = createRequire(__filename);
// xml2js comes with office-addin-manifest (a dev dependency), which parses manifests with it.
const { parseStringPromise } = requireHere('xml2js') as { parseStringPromise(xml: string): Promise<Record<string, unknown>> };
const { drawIcon, SIZES } = requireHere('../scripts/make-icons.js') as { drawIcon(size: number): Buffer; SIZES: number[] };

const root = path.join(__dirname, '..');
const manifestPath = path.join(root, 'manifest.xml');
const text = readFileSync(manifestPath, 'utf8');
const DEV = 'https://localhost:3000/';

// xml2js shape: elements are arrays, attributes under `$`.
type Node = { $?: Record<string, string>; _?: string } & { [child: string]: Node[] | Record<string, string> | string | undefined };
let app: Node;

function child(node: Node, name: string): Node {
  const list = node[name] as Node[] | undefined;
  if (!list || list.length !== 1) throw new Error(`expected one <${name}> (found ${list ? list.length : 0})`);
  return list[0];
}
function children(node: Node, name: string): Node[] {
  return (node[name] as Node[] | undefined) ?? [];
}
function attr(node: Node, name: string): string {
  const v = node.$?.[name];
  if (v === undefined) throw new Error(`missing attribute ${name}`);
  return v;
}

let resources: { urls: Map<string, string>; images: Map<string, string>; shortStrings: Map<string, string>; longStrings: Map<string, string> };
let host: Node;

beforeAll(async () => {
  const doc = await parseStringPromise(text);
  app = doc.OfficeApp as Node;
  const overrides = child(app, 'VersionOverrides');
  host = child(child(overrides, 'Hosts'), 'Host');
  const res = child(overrides, 'Resources');
  const table = (group: string, item: string) =>
    new Map(children(child(res, group), item).map((n) => [attr(n, 'id'), attr(n, 'DefaultValue')] as [string, string]));
  resources = {
    urls: table('bt:Urls', 'bt:Url'),
    images: table('bt:Images', 'bt:Image'),
    shortStrings: table('bt:ShortStrings', 'bt:String'),
    longStrings: table('bt:LongStrings', 'bt:String'),
  };
});

describe('manifest.xml', () => {
  it('is read by `office-addin-manifest info` (offline)', () => {
    const cli = path.join(root, 'node_modules/office-addin-manifest/cli.js');
    const r = spawnSync(process.execPath, [cli, 'info', manifestPath], { encoding: 'utf8', input: '' });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toContain('Name: Hush absorber planner');
    expect(r.stdout).toContain('Hosts: Workbook');
    expect(r.stdout).toContain('Type: TaskPaneApp');
    expect(r.stdout).toContain(`Source Location: ${DEV}taskpane.html`);
  });

  it('is a task pane add-in for workbooks with our own name and a version-4 GUID', () => {
    expect(attr(app, 'xsi:type')).toBe('TaskPaneApp');
    expect(child(app, 'Id') as unknown as string).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    expect(attr(child(app, 'DisplayName'), 'DefaultValue')).toBe('Hush absorber planner');
    expect(attr(child(child(app, 'Hosts'), 'Host'), 'Name')).toBe('Workbook');
    expect(attr(child(child(app, 'DefaultSettings'), 'SourceLocation'), 'DefaultValue')).toBe(`${DEV}taskpane.html`);
  });

  it('the manifest version follows package.json (n.n.n.0)', () => {
    const pkg = JSON.parse(readFileSync(path.join(root, 'package.json'), 'utf8'));
    expect(child(app, 'Version') as unknown as string).toBe(`${pkg.version}.0`);
    // The version the command line and the worksheet report (src/plan/version.ts) is the package's.
    expect(APP_VERSION).toBe(pkg.version);
  });

  it('requires SharedRuntime 1.1 and CustomFunctionsRuntime 1.2, the set of CustomFunctions.Error the functions return', () => {
    const sets = children(child(child(app, 'Requirements'), 'Sets'), 'Set').map((s) => [attr(s, 'Name'), attr(s, 'MinVersion')]);
    expect(sets).toEqual(
      expect.arrayContaining([
        ['SharedRuntime', '1.1'],
        // "CustomFunctions.Error class … API set: CustomFunctionsRuntime 1.2" (Microsoft Learn, Office JavaScript API reference).
        ['CustomFunctionsRuntime', '1.2'],
      ]),
    );
    // The requirement follows from the code: the worksheet functions report errors with messages.
    expect(readFileSync(path.join(root, 'src/functions/errors.ts'), 'utf8')).toMatch(/new CustomFunctions\.Error\(\w+, /);
  });

  it('declares one long-lived runtime on taskpane.html, first inside <Host>', () => {
    const runtimes = children(child(host, 'Runtimes'), 'Runtime');
    expect(runtimes).toHaveLength(1);
    expect(attr(runtimes[0], 'lifetime')).toBe('long');
    expect(attr(runtimes[0], 'resid')).toBe('Taskpane.Url');
    expect(resources.urls.get('Taskpane.Url')).toBe(`${DEV}taskpane.html`);
    // The shared runtime loads only when <Runtimes> comes straight after <Host> (same source).
    const hostBody = text.slice(text.indexOf('<Host xsi:type="Workbook">'));
    expect(hostBody.search(/<Runtimes>/)).toBeLessThan(hostBody.search(/<AllFormFactors>/));
  });

  it('runs the functions in that same runtime, under the HUSH namespace, with generated metadata', () => {
    const ext = child(child(host, 'AllFormFactors'), 'ExtensionPoint');
    expect(attr(ext, 'xsi:type')).toBe('CustomFunctions');
    expect(attr(child(child(ext, 'Page'), 'SourceLocation'), 'resid')).toBe('Taskpane.Url');
    expect(resources.urls.get(attr(child(child(ext, 'Script'), 'SourceLocation'), 'resid'))).toBe(`${DEV}functions.js`);
    expect(resources.urls.get(attr(child(child(ext, 'Metadata'), 'SourceLocation'), 'resid'))).toBe(`${DEV}functions.json`);
    expect(resources.shortStrings.get(attr(child(ext, 'Namespace'), 'resid'))).toBe('HUSH');
  });

  it('has a ribbon button that opens the task pane, with the function file in the shared runtime', () => {
    const desktop = child(host, 'DesktopFormFactor');
    expect(attr(child(desktop, 'FunctionFile'), 'resid')).toBe('Taskpane.Url');
    const surface = child(desktop, 'ExtensionPoint');
    expect(attr(surface, 'xsi:type')).toBe('PrimaryCommandSurface');
    const control = child(child(child(surface, 'OfficeTab'), 'Group'), 'Control');
    expect(attr(control, 'xsi:type')).toBe('Button');
    const action = child(control, 'Action');
    expect(attr(action, 'xsi:type')).toBe('ShowTaskpane');
    expect(attr(child(action, 'SourceLocation'), 'resid')).toBe('Taskpane.Url');
  });

  it('resolves every resid it uses', () => {
    const known = new Set([...resources.urls.keys(), ...resources.images.keys(), ...resources.shortStrings.keys(), ...resources.longStrings.keys()]);
    const used = [...text.matchAll(/resid="([^"]+)"/g)].map((m) => m[1]);
    expect(used.length).toBeGreaterThan(10);
    for (const id of used) expect(known.has(id), id).toBe(true);
  });

  it('every icon it names exists in assets/ as a PNG of the size it claims', () => {
    const urls = [...text.matchAll(/https:\/\/localhost:3000\/(assets\/icon-(\d+)\.png)/g)];
    expect(urls.length).toBeGreaterThanOrEqual(5);
    for (const [, file, size] of urls) {
      const png = readFileSync(path.join(root, file));
      expect(png.subarray(0, 8).toString('hex'), file).toBe('89504e470d0a1a0a');
      // IHDR: width and height, big-endian, at bytes 16 and 20 (PNG specification, §11.2.2).
      expect(png.readUInt32BE(16), file).toBe(Number(size));
      expect(png.readUInt32BE(20), file).toBe(Number(size));
    }
  });

  it('the icons are what scripts/make-icons.js draws (regenerate them with `npm run icons`)', () => {
    expect(SIZES).toEqual([16, 32, 64, 80, 128]);
    for (const size of SIZES) {
      expect(Buffer.compare(drawIcon(size), readFileSync(path.join(root, `assets/icon-${size}.png`))), `icon-${size}.png`).toBe(0);
    }
  });
});
