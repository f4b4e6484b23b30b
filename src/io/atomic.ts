/**
 * Writing files so that a reader never sees half of one: the bytes go to a
 * temporary file in the target's directory, are flushed, and the temporary
 * file is renamed over the target (rename is atomic within one file system).
 * If anything fails, the temporary file is removed and the target is left as
 * it was.
 */
import { randomUUID } from 'node:crypto';
import { mkdir, open, rename, rm, stat } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../core/errors.js';

/**
 * Create a directory and its missing parents; fine if it already exists.
 * @throws InputError 'io.not-a-directory' when the path (or a parent) is a file,
 *   'io.write-failed' for other failures (permissions, read-only disk).
 */
export async function ensureDir(path: string): Promise<void> {
  try {
    await mkdir(path, { recursive: true });
  } catch (err) {
    const code = errCode(err);
    if (code === 'EEXIST' || code === 'ENOTDIR') {
      throw new InputError('io.not-a-directory', `${path}: exists but is not a directory (or a parent is a file); choose another output folder`);
    }
    throw new InputError('io.write-failed', `${path}: cannot create the directory (${code}); choose a writable output folder`);
  }
}

/**
 * Write `data` (text as UTF-8, or bytes) to `path` atomically, creating parent
 * directories. The temporary file is `.<name>.<uuid>.tmp` beside the target.
 * @throws InputError 'io.write-failed' (or 'io.not-a-directory') when the file cannot be written.
 */
export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
  const dir = dirname(path);
  await ensureDir(dir);
  if (await isDirectory(path)) {
    throw new InputError('io.write-failed', `${path}: is a directory; give a file path to write to`);
  }
  const tmp = join(dir, `.${basename(path)}.${randomUUID()}.tmp`);
  try {
    const fh = await open(tmp, 'wx');
    try {
      await fh.writeFile(data);
      await fh.sync();
    } finally {
      await fh.close();
    }
    await rename(tmp, path);
  } catch (err) {
    await rm(tmp, { force: true });
    if (!isSystemError(err)) throw err;
    throw new InputError('io.write-failed', `${path}: cannot write the file (${errCode(err)}); check that the folder is writable and the disk has space`);
  }
}

async function isDirectory(path: string): Promise<boolean> {
  try {
    return (await stat(path)).isDirectory();
  } catch {
    return false;
  }
}

/** A failure reported by the operating system (ENOENT, EACCES, ENOSPC, …), as opposed to a programming error. */
function isSystemError(err: unknown): boolean {
  const code = (err as NodeJS.ErrnoException | null)?.code;
  return typeof code === 'string' && /^E[A-Z]+$/.test(code);
}

function errCode(err: unknown): string {
  return (err as NodeJS.ErrnoException).code ?? String(err);
}
