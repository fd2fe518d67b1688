/** Output files of sheet and label: the target checked before any work, the format, the write verified after. */
import { accessSync, constants as fsConstants, lstatSync, readdirSync, statSync, unlinkSync } from 'node:fs';
import { dirname, extname, join } from 'node:path';
import { ProblemError, type WriteCause } from '../core/index.js';
import { writeFileAtomic } from '../io/atomic.js';
import { writePdf } from '../io/pdf.js';
import type { Cli } from './context.js';

export function isDirectory(p: string): boolean {
  try {
    return statSync(p).isDirectory();
  } catch {
    return false;
  }
}

export function listLogs(dir: string): string[] {
  return readdirSync(dir)
    .filter((f) => /\.(jsonl|csv)$/i.test(f))
    .sort()
    .map((f) => join(dir, f));
}

const refuse = (path: string, cause: WriteCause, field?: string, outcome?: string): never => {
  throw new ProblemError(
    outcome === undefined ? { code: 'write-failed', cause } : { code: 'write-failed', cause, outcome },
    field ? { file: path, field } : { file: path },
  );
};

/**
 * Refuse an output path that cannot take the file, before anything is computed or
 * written: a folder, a missing or read-only folder, an existing file (or link, even a
 * dangling one) without --force. The write itself stays atomic (io/atomic.ts).
 */
export function checkOutputTarget(path: string, force: boolean): void {
  let st: ReturnType<typeof lstatSync> | undefined;
  try {
    st = lstatSync(path);
  } catch {
    st = undefined;
  }
  if (st) {
    if (isDirectory(path)) refuse(path, { kind: 'is-folder' }, '--output');
    if (!force) refuse(path, { kind: 'exists', what: st.isSymbolicLink() ? 'symlink' : 'file' }, '--output');
  }
  const folder = dirname(path);
  if (!isDirectory(folder)) refuse(path, { kind: 'no-folder', folder }, '--output');
  try {
    accessSync(folder, fsConstants.W_OK);
  } catch {
    refuse(path, { kind: 'folder-not-writable', folder }, '--output');
  }
}

/**
 * "wrote" is said only of a file that holds every byte: a short write (a full disk)
 * that slipped through is found here, the truncated file removed and the write refused.
 */
export function verifyWritten(path: string, bytes: number): void {
  let size: number;
  try {
    size = statSync(path).size;
  } catch {
    return refuse(path, { kind: 'missing-after-write' }, undefined, 'nothing was written');
  }
  if (size !== bytes) {
    try {
      unlinkSync(path);
    } catch {
      // removing it is a courtesy; the refusal below stands either way
    }
    refuse(
      path,
      { kind: 'short-write', written: size, expected: bytes },
      undefined,
      'the incomplete file was removed',
    );
  }
}

/** the sheet formats, by file extension */
const FORMAT_OF_EXTENSION: Readonly<Record<string, string>> = {
  '.html': 'html',
  '.htm': 'html',
  '.md': 'md',
  '.markdown': 'md',
  '.txt': 'txt',
  '.pdf': 'pdf',
};

/**
 * the sheet's format: --format, else from the extension of -o, else html; a known extension
 * that disagrees is refused
 */
export function sheetFormat(format: string | undefined, output: string | undefined): string {
  const ext = output ? extname(output).toLowerCase() : '';
  const fromExt = Object.prototype.hasOwnProperty.call(FORMAT_OF_EXTENSION, ext)
    ? FORMAT_OF_EXTENSION[ext]
    : undefined;
  if (format === undefined) {
    if (!output) return 'html';
    if (fromExt) return fromExt;
    throw new ProblemError(
      { code: 'format-unknown', file: output, extension: ext, known: Object.keys(FORMAT_OF_EXTENSION) },
      { field: '--output' },
    );
  }
  // md and txt are both plain text; html and pdf are not interchangeable with anything
  const plain = (f: string) => f === 'md' || f === 'txt';
  if (fromExt && fromExt !== format && !(plain(fromExt) && plain(format)))
    throw new ProblemError({ code: 'format-mismatch', format, extension: ext }, { field: '--format' });
  return format;
}

/**
 * a rendered document to its place: a PDF (which needs -o) through Chromium, text to -o (every
 * byte checked after the write) or to stdout; `example` is the file name the refusal of a PDF without -o suggests
 */
export async function emitDocument(
  cli: Cli,
  doc: { format: string; output?: string; force: boolean; example: string },
  render: () => string,
  html: () => string,
): Promise<void> {
  if (doc.format === 'pdf') {
    if (!doc.output)
      throw new ProblemError({ code: 'pdf-needs-file', example: doc.example }, { field: '--output' });
    await writePdf(html(), doc.output, doc.force);
    cli.out(`wrote ${doc.output}\n`);
    return;
  }
  const text = render();
  if (!doc.output) return cli.out(text);
  writeFileAtomic(doc.output, text, doc.force);
  verifyWritten(doc.output, Buffer.byteLength(text, 'utf8'));
  cli.out(`wrote ${doc.output}\n`);
}
