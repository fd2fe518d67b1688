/** PDF through headless Chromium, where it is installed. */
import { nodeChildProcess, nodeOs } from './builtins.js';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fail } from '../core/index.js';
import { writeFileAtomic } from './atomic.js';

const CANDIDATES = ['chromium', 'chromium-browser', 'google-chrome'];

export function findChromium(): string | undefined {
  for (const c of CANDIDATES) {
    const r = nodeChildProcess().spawnSync('sh', ['-c', `command -v ${c}`], { encoding: 'utf8' });
    if (r.status === 0 && r.stdout.trim()) return r.stdout.trim();
  }
  return undefined;
}

export async function writePdf(html: string, output: string, force: boolean): Promise<void> {
  const chromium = findChromium();
  if (!chromium) {
    fail({ code: 'pdf-no-browser' }, { field: '--format pdf' });
  }
  const dir = mkdtempSync(join(nodeOs().tmpdir(), 'mixwright-pdf-'));
  try {
    const src = join(dir, 'sheet.html');
    const pdf = join(dir, 'sheet.pdf');
    writeFileSync(src, html);
    const r = nodeChildProcess().spawnSync(
      chromium,
      [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--no-first-run',
        '--disable-quic',
        `--user-data-dir=${join(dir, 'profile')}`,
        '--no-pdf-header-footer',
        `--print-to-pdf=${pdf}`,
        src,
      ],
      { encoding: 'utf8', timeout: 60000 },
    );
    let bytes: Buffer;
    try {
      bytes = readFileSync(pdf);
    } catch {
      const detail = (r.stderr || '')
        .split('\n')
        .filter((l) => /error/i.test(l))
        .slice(0, 2)
        .join(' ');
      return fail({ code: 'pdf-not-made', status: r.status, detail }, { field: '--format pdf' });
    }
    writeFileAtomic(output, bytes, force);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
