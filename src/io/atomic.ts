/**
 * Writes that either happen in full or say that they did not.
 *
 * writeFileAtomic: a temporary file in the same folder, every byte written (the count
 * writeSync returns is checked and the rest written again), fsync, then moved into place:
 * by a hard link when the name must not exist (the link fails if it does, so there is no
 * window for an overwrite), by rename with --force. An existing name of any kind (a file,
 * a folder, a symlink even when it dangles: lstat, not exists) is never replaced without
 * force, and a folder never. On any failure the temporary file is removed and a
 * `write-failed` problem names the path and the cause (disk full, I/O error, short write,
 * no permission); nothing is reported written that was not.
 */
import {
  closeSync,
  fsyncSync,
  linkSync,
  lstatSync,
  openSync,
  renameSync,
  unlinkSync,
  writeSync,
} from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { fail, ProblemError, type WriteCause } from '../core/index.js';

/** the cause of a failed write, in words a lab member can act on */
export function writeErrorReason(e: unknown): string {
  const err = e as NodeJS.ErrnoException;
  switch (err?.code) {
    case 'ENOSPC':
      return 'the disk is full (ENOSPC); free some space and try again';
    case 'EDQUOT':
      return 'the disk quota is used up (EDQUOT); free some space and try again';
    case 'EIO':
      return 'the device reported an input/output error (EIO); check the disk or the network share';
    case 'EACCES':
    case 'EPERM':
      return `no permission to write there (${err.code}); choose a folder you may write to`;
    case 'EROFS':
      return 'the file system is read-only (EROFS)';
    case 'ENOENT':
      return 'the folder does not exist';
    case 'ENOTDIR':
      return 'a part of the path is a file, not a folder (ENOTDIR)';
    case 'EISDIR':
      return 'the name is a folder, not a file (EISDIR)';
    case 'ENAMETOOLONG':
      return 'the file name is too long';
    case 'EFBIG':
      return 'the file is larger than the file system allows (EFBIG)';
    default:
      return err?.code ? `${err.code}: ${err.message}` : String((e as Error)?.message ?? e);
  }
}

/** a short write that the operating system reported without an error code */
export class ShortWriteError extends Error {
  constructor(
    readonly written: number,
    readonly expected: number,
  ) {
    super(`short write: ${written} of ${expected} bytes written`);
    this.name = 'ShortWriteError';
  }
}

/**
 * write every byte of buf at the file's current offset (or appended, for a file opened
 * with 'a'); writeSync may write fewer bytes than asked, so it loops; a call that writes
 * nothing is a short write (a full disk that does not say ENOSPC)
 */
export function writeAllSync(fd: number, buf: Uint8Array): void {
  let off = 0;
  while (off < buf.length) {
    const n = writeSync(fd, buf, off, buf.length - off);
    if (!(n > 0)) throw new ShortWriteError(off, buf.length);
    off += n;
  }
}

/**
 * Why a write failed, as the typed cause of a write-failed problem: a short write with its byte
 * counts, else the operating system's error code and a plain account of it. `code`: where the
 * message shows the error code, inside the account as writeErrorReason words it ("the disk is
 * full (ENOSPC); free some space ...", file writes), or after it ("the disk is full; free some
 * space ... (ENOSPC)", the batch log: the account is kept free of the code, and the wording adds it).
 */
export function writeCauseOf(e: unknown, code: 'inside' | 'after' = 'inside'): WriteCause {
  if (e instanceof ShortWriteError) return { kind: 'short-write', written: e.written, expected: e.expected };
  const err = e as NodeJS.ErrnoException;
  const errno = typeof err?.code === 'string' ? err.code : 'no error code';
  const text = writeErrorReason(e);
  const message =
    code === 'after' && err?.code ? text.replace(` (${err.code})`, '').replace(`${err.code}: `, '') : text;
  return { kind: 'system', errno, message };
}

/** writeCauseOf with the error code after the account (the batch log's wording) */
export const writeCauseCodeAfter = (e: unknown): WriteCause => writeCauseOf(e, 'after');

/** fsync a folder so that a new name in it survives a power cut; not every platform allows it */
export function fsyncFolder(dir: string): void {
  let fd: number | undefined;
  try {
    fd = openSync(dir, 'r');
    fsyncSync(fd);
  } catch {
    // some file systems refuse fsync on a folder; the file's own fsync has been done
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

/** what is at a name, without following a symlink: undefined when nothing is */
function whatIsAt(path: string): 'file' | 'folder' | 'symlink' | 'other' | undefined {
  try {
    const st = lstatSync(path);
    return st.isSymbolicLink() ? 'symlink' : st.isDirectory() ? 'folder' : st.isFile() ? 'file' : 'other';
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    return fail({ code: 'write-failed', cause: writeCauseOf(e) }, { file: path });
  }
}

/**
 * move a finished temporary file to a name that must not exist: a hard link fails if the
 * name appeared meanwhile (never an overwrite without force); where the file system has no
 * hard links, the name is checked again and the file renamed
 */
function placeNew(tmp: string, path: string): void {
  try {
    linkSync(tmp, path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code !== 'EPERM' && code !== 'ENOTSUP' && code !== 'EOPNOTSUPP' && code !== 'EMLINK') throw e;
    if (whatIsAt(path) !== undefined) throw Object.assign(new Error('exists'), { code: 'EEXIST' });
    renameSync(tmp, path);
    return;
  }
  unlinkSync(tmp);
}

export function writeFileAtomic(path: string, data: string | Uint8Array, force: boolean): void {
  const there = whatIsAt(path);
  if (there === 'folder') fail({ code: 'write-failed', cause: { kind: 'is-folder' } }, { file: path });
  if (there === 'other' || (there !== undefined && !force))
    fail({ code: 'write-failed', cause: { kind: 'exists', what: there } }, { file: path });
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  let fd: number | undefined;
  let created = false;
  try {
    try {
      fd = openSync(tmp, 'wx');
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
      // a temporary file left by an earlier run of this process id: it was never moved into place
      unlinkSync(tmp);
      fd = openSync(tmp, 'wx');
    }
    created = true;
    writeAllSync(fd, typeof data === 'string' ? Buffer.from(data, 'utf8') : data);
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    if (there === undefined) placeNew(tmp, path);
    else renameSync(tmp, path);
    created = false;
    fsyncFolder(dirname(path) || '.');
  } catch (e) {
    if (fd !== undefined) {
      try {
        closeSync(fd);
      } catch {
        // the close of a file being abandoned; the write error is what is reported
      }
    }
    if (created) {
      try {
        unlinkSync(tmp);
      } catch {
        // already gone
      }
    }
    if (e instanceof ProblemError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'EEXIST')
      fail({ code: 'write-failed', cause: { kind: 'appeared-while-writing' } }, { file: path });
    return fail({ code: 'write-failed', cause: writeCauseOf(e) }, { file: path });
  }
}
