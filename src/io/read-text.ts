/**
 * Read a text file, or raise the one problem that says why not.
 *
 * Only a regular file of a sane size is read: the file is opened without blocking
 * (a named pipe would otherwise wait for a writer forever), checked with fstat on
 * the open descriptor (no race between the check and the read), and read up to
 * MAX_TEXT_BYTES + 1 bytes at most, so a device such as /dev/zero or a file that
 * grows while it is read cannot exhaust memory. A UTF-8 byte-order mark (Excel
 * writes one into CSV files) is dropped.
 */
import { closeSync, constants, fstatSync, openSync, readSync, type Stats } from 'node:fs';
import { fail, type ReadCause } from '../core/index.js';

/** the largest input file read, bytes: recipes, lab profiles, readings and batch logs are a few kB */
export const MAX_TEXT_BYTES = 8 * 1024 * 1024;

/** what a name that is not a regular file is */
function kindOf(st: Stats): 'folder' | 'fifo' | 'device' | 'socket' | 'other' {
  if (st.isDirectory()) return 'folder';
  if (st.isFIFO()) return 'fifo';
  if (st.isCharacterDevice() || st.isBlockDevice()) return 'device';
  if (st.isSocket()) return 'socket';
  return 'other';
}

/** the system's refusal, as a read cause */
const systemCause = (e: unknown): ReadCause => ({
  kind: 'system',
  errno: (e as NodeJS.ErrnoException).code ?? 'unknown error',
});

export function readTextFile(file: string): string {
  let fd: number;
  try {
    fd = openSync(file, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    return fail({ code: 'file-unreadable', cause: systemCause(e) }, { file });
  }
  try {
    const st = fstatSync(fd);
    if (!st.isFile())
      return fail({ code: 'file-unreadable', cause: { kind: 'not-regular', what: kindOf(st) } }, { file });
    if (st.size > MAX_TEXT_BYTES)
      return fail({ code: 'file-too-large', bytes: st.size, limitBytes: MAX_TEXT_BYTES }, { file });
    // read to the end, but never past the limit (a file may grow, or report size 0 as /proc files do)
    const chunks: Buffer[] = [];
    let total = 0;
    for (;;) {
      const buf = Buffer.allocUnsafe(Math.min(65536, MAX_TEXT_BYTES + 1 - total));
      let n: number;
      try {
        n = readSync(fd, buf, 0, buf.length, null);
      } catch (e) {
        return fail({ code: 'file-unreadable', cause: systemCause(e) }, { file });
      }
      if (n === 0) break;
      chunks.push(buf.subarray(0, n));
      total += n;
      if (total > MAX_TEXT_BYTES)
        return fail({ code: 'file-too-large', bytes: total, limitBytes: MAX_TEXT_BYTES }, { file });
    }
    const bytes = Buffer.concat(chunks, total);
    if (bytes.includes(0)) return fail({ code: 'file-unreadable', cause: { kind: 'binary' } }, { file });
    const text = bytes.toString('utf8');
    return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  } finally {
    closeSync(fd);
  }
}
