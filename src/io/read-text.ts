/** Read a text file, or raise the one problem that says why not. */
import { readFileSync } from 'node:fs';
import { fail } from '../core/index.js';

export function readTextFile(file: string): string {
  try {
    return readFileSync(file, 'utf8');
  } catch (e) {
    const err = e as NodeJS.ErrnoException;
    return fail({ code: 'file-unreadable', reason: err.code === 'ENOENT' ? 'no such file' : err.code === 'EISDIR' ? 'it is a folder, not a file' : err.message }, { file });
  }
}
