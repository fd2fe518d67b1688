// label and certificate of a batch filled from a premix log (batch log header premix_logs): the premix
// tank, its log and its re-checked composition +- U, from the logs as `check` computes them; a premix
// log that is missing or changed is said, and the premix is never printed as checked.
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { appendEvent } from '../../src/io/batch-log.js';
import { withU } from '../../src/report/label-model.js';
import { certificateFlowed, labelBoxText, runCli, TORR } from '../helpers.js';

const BATCH = 'batches/demo-ch4-phi1-from-premix.jsonl';
const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const TRIALS = ['--trials', '100000'];

/** the batch log and its premix log copied into a fresh folder (the batch names the premix log relative to it) */
function copied(): { dir: string; batch: string; premix: string } {
  const dir = mkdtempSync(join(tmpdir(), 'mw-label-premix-'));
  const batch = join(dir, 'demo-ch4-phi1-from-premix.jsonl');
  const premix = join(dir, 'demo-premix-o2-ar-mt2.jsonl');
  copyFileSync(BATCH, batch);
  copyFileSync(PREMIX, premix);
  return { dir, batch, premix };
}

describe('label of a batch made from a premix log', () => {
  it("names the premix tank and log and gives its re-checked composition +- U, the values of check --json's premix_logs", async () => {
    const j = JSON.parse((await runCli(['check', BATCH, ...TRIALS, '--json'])).stdout);
    const p = j.premix_logs[0];
    const r = await runCli(['label', BATCH, ...TRIALS]);
    expect(r.code, r.stderr).toBe(0);
    const box = r.stdout.slice(0, r.stdout.indexOf('BATCH CERTIFICATE'));
    expect(box).toContain('Made from premix demo-premix-o2-ar-mt2 in MT-2, re-checked from its log:');
    expect(box).toContain(`demo-premix-o2-ar-mt2.jsonl (last entry ${p.last_entry_sha256.slice(0, 12)})`);
    // each premix gas with U = 2u to two significant digits, as check computed them (identity of the same report)
    for (const k of ['O2', 'Ar']) {
      const c = p.composition[k];
      expect(box).toContain(`  ${k} ${withU(c.value * 100, 2 * c.u * 100, '%')}`);
    }
    // O2 13.423 % +- 0.035 % (the premix's re-check, README: O2 0.134230 +- 0.00035)
    expect(box).toContain('O2 13.423 % +- 0.035 %');
    expect(box).toMatch(/^\| PASS/m);
    // the certificate's Premix paragraph: tank, log and last entry, the re-checked fractions
    // the certificate's paragraphs wrap at 80 columns: read whole
    const cert = certificateFlowed(r.stdout);
    expect(cert).toMatch(
      /^PREMIX Made from premix demo-premix-o2-ar-mt2 in tank MT-2: log demo-premix-o2-ar-mt2\.jsonl \(last entry c6e05a4b28ac, the one this batch log recorded\), re-checked now from its readings by check's model: Ar 86\.577 % \+- 0\.035 %, O2 13\.423 % \+- 0\.035 %/m,
    );
    for (const format of ['md', 'html']) {
      const o = await runCli(['label', BATCH, ...TRIALS, '--format', format]);
      expect(o.code).toBe(0);
      expect(o.stdout).toContain('Premix');
      expect(o.stdout).toMatch(/O2 13\.423 % ± 0\.035 %/);
    }
  });

  it('a batch of cylinders only has no premix lines', async () => {
    const r = await runCli(['label', 'batches/demo-ch4-phi1-ar98.jsonl', ...TRIALS]);
    // the demo is not shown within tolerance: exit 7 as check
    expect(r.code).toBe(7);
    expect(r.stdout).not.toMatch(/premix/i);
  });

  it('a missing premix log: the label says so, no PASS, no premix printed as checked; exit 2 as check', async () => {
    const { batch, premix } = copied();
    rmSync(premix);
    expect((await runCli(['check', batch, ...TRIALS])).code).toBe(2);
    const r = await runCli(['label', batch, ...TRIALS]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/a premix log it was made from is missing, changed or not usable/);
    const box = r.stdout.slice(0, r.stdout.indexOf('BATCH CERTIFICATE'));
    expect(box).toContain('*** PREMIX NOT RE-CHECKED: COMPOSITION NOT PROVEN ***');
    expect(box).toContain('*** PREMIX IN MT-2 NOT RE-CHECKED: its log is missing or unreadable ***');
    expect(box).toContain('*** DO NOT USE AS THE DESIGN MIXTURE ***');
    expect(r.stdout).not.toMatch(/PASS/);
    expect(r.stdout).not.toContain('re-checked from its log');
    expect(r.stdout).not.toContain('13.423 %');
    // the certificate gives the refusal in full, and no species row reads as within
    expect(certificateFlowed(r.stdout)).toMatch(
      /NOT RE-CHECKED - premix log demo-premix-o2-ar-mt2\.jsonl cannot be read/,
    );
    // (the composition table's rows: the plan's findings the log carries may wrap a line at "within")
    const at = r.stdout.indexOf('COMPOSITION (mole fraction');
    expect(at).toBeGreaterThan(0);
    const table = r.stdout.slice(at, r.stdout.indexOf('\n\n', at));
    expect(table).not.toMatch(/ within$/m);
    expect(table).toMatch(/O2 .* not shown \(premix\)$/m);
  });

  it('a premix log changed since the batch recorded it (a barometer line appended): said, never shown as checked', async () => {
    const { batch, premix } = copied();
    appendEvent(premix, {
      kind: 'barometer',
      reading: '752.0 Torr',
      pressure_Pa: 752 * TORR,
      by: 'QX',
      time: '2026-12-01T08:00:00Z',
    });
    const r = await runCli(['label', batch, ...TRIALS]);
    expect(r.code).toBe(2);
    // the label's box wraps its lines at 76 columns: read with its wrapped rows joined
    const box = labelBoxText(r.stdout);
    expect(box).toContain('PREMIX IN MT-2 NOT RE-CHECKED: its log has changed since this batch recorded it');
    expect(certificateFlowed(r.stdout)).toMatch(/has changed since the batch log recorded it/);
    expect(r.stdout).not.toMatch(/PASS/);
    expect(r.stdout).not.toContain('13.423 %');
    const html = await runCli(['label', batch, ...TRIALS, '--format', 'html']);
    expect(html.code).toBe(2);
    expect(html.stdout).toContain(
      'PREMIX IN MT-2 NOT RE-CHECKED: its log has changed since this batch recorded it',
    );
  });
});
