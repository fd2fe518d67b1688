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
import { fail } from '../core/index.js';

/** the largest input file read, bytes: recipes, lab profiles, readings and batch logs are a few kB */
export const MAX_TEXT_BYTES = 8 * 1024 * 1024;

function kindOf(st: Stats): string {
  if (st.isDirectory()) return 'it is a folder, not a file';
  if (st.isFIFO())
    return (
      'it is a named pipe (FIFO), not a regular file; pipes are not read because ' +
      'they can wait forever. Save the content to a file and give that file'
    );
  if (st.isCharacterDevice() || st.isBlockDevice())
    return 'it is a device, not a regular file; give a recipe, lab profile, readings or log file';
  if (st.isSocket()) return 'it is a socket, not a regular file';
  return 'it is not a regular file';
}

function reasonOf(err: NodeJS.ErrnoException): string {
  switch (err.code) {
    case 'ENOENT':
      return 'no such file';
    case 'EISDIR':
      return 'it is a folder, not a file';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied; check the file permissions';
    case 'ENOTDIR':
      return 'a part of the path is not a folder';
    case 'ENAMETOOLONG':
      return 'the path is too long';
    case 'ELOOP':
      return 'the path has a symbolic link loop';
    default:
      return `the system refused it (${err.code ?? 'unknown error'})`;
  }
}

export function readTextFile(file: string): string {
  let fd: number;
  try {
    fd = openSync(file, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    return fail({ code: 'file-unreadable', reason: reasonOf(e as NodeJS.ErrnoException) }, { file });
  }
  try {
    const st = fstatSync(fd);
    if (!st.isFile()) return fail({ code: 'file-unreadable', reason: kindOf(st) }, { file });
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
        return fail({ code: 'file-unreadable', reason: reasonOf(e as NodeJS.ErrnoException) }, { file });
      }
      if (n === 0) break;
      chunks.push(buf.subarray(0, n));
      total += n;
      if (total > MAX_TEXT_BYTES)
        return fail({ code: 'file-too-large', bytes: total, limitBytes: MAX_TEXT_BYTES }, { file });
    }
    const bytes = Buffer.concat(chunks, total);
    if (bytes.includes(0))
      return fail(
        {
          code: 'file-unreadable',
          reason: 'it holds NUL bytes, so it is not a text file; give a YAML, CSV or JSON-lines text file',
        },
        { file },
      );
    const text = bytes.toString('utf8');
    return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  } finally {
    closeSync(fd);
  }
}
