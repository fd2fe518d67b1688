/** Atomic file writes: a temporary file in the same folder, fsync, then rename. Never overwrites without force. */
import { closeSync, existsSync, fsyncSync, openSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { fail } from '../core/index.js';

export function writeFileAtomic(path: string, data: string | Uint8Array, force: boolean): void {
  if (existsSync(path) && !force) fail({ code: 'file-unreadable', reason: 'the file exists; add --force to replace it, or choose another name' }, { file: path });
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  let fd: number | undefined;
  try {
    fd = openSync(tmp, 'wx');
    writeSync(fd, typeof data === 'string' ? Buffer.from(data, 'utf8') : data);
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    renameSync(tmp, path);
  } catch (e) {
    if (fd !== undefined) closeSync(fd);
    if (existsSync(tmp)) unlinkSync(tmp);
    const err = e as NodeJS.ErrnoException;
    if (err.code === 'ENOENT') fail({ code: 'file-unreadable', reason: 'the folder does not exist' }, { file: path });
    throw e;
  }
}
