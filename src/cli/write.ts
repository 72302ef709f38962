import { promises as fs } from 'fs';
import * as path from 'path';
import { UsageError } from './args';

/**
 * Writes `text` to `file` through a temporary file renamed into place, so a
 * failed write leaves no half file; an existing file is replaced only when
 * `replace` is true (a command never writes over what the user has without
 * being told to).
 */
export async function writeFileAtomic(file: string, text: string, replace: boolean): Promise<void> {
  const exists = await fs.stat(file).then(
    () => true,
    () => false,
  );
  if (exists && !replace) throw new UsageError(`--out ${file} already exists; give --replace to overwrite it, or choose another name`);
  const temp = path.join(path.dirname(file), `.${path.basename(file)}.${process.pid}.tmp`);
  try {
    await fs.writeFile(temp, text, 'utf8');
    await fs.rename(temp, file);
  } catch (e) {
    await fs.rm(temp, { force: true }).catch(() => undefined);
    throw new UsageError(`cannot write ${file}: ${e instanceof Error ? e.message : String(e)}`);
  }
}
