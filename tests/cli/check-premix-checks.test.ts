// Stage 2: the premix tank is confirmed mixed and read against the minimum the batch needs before
// the first fill from it (`premix-mixed`, `premix-reading` lines). `check` (text and JSON) and the
// certificate list them - who, when, the reading against its minimum, refused ones too - instead of
// leaving no trace. The log is the demo stage-2 log with those lines inserted before its premix fill
// and re-chained; no computed number is checked here, only what is said of the record.
import { copyFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { LogHeader, NewLogEvent } from '../../src/io/batch-log.js';
import { certificateFlowed, runCli, TORR } from '../helpers.js';
import { logLines, rechain } from '../relog.js';

const DEMO = 'batches/demo-ch4-phi1-from-premix.jsonl';

/** a copy of the demo stage-2 log's folder (its premix log beside it) and its lines without the premix checks */
function demoWithoutChecks(): { dir: string; header: LogHeader; events: NewLogEvent[] } {
  const dir = mkdtempSync(join(tmpdir(), 'mw-premix-checks-'));
  copyFileSync('batches/demo-premix-o2-ar-mt2.jsonl', join(dir, 'demo-premix-o2-ar-mt2.jsonl'));
  const { header, events } = logLines(DEMO);
  return { dir, header, events: events.filter((e) => !e.kind.startsWith('premix-')) };
}

/** the demo stage-2 log re-chained without its premix check lines (as a log made before the fill asked them) */
function withoutPremixChecks(): string {
  const { dir, header, events } = demoWithoutChecks();
  return rechain(join(dir, 'b0.jsonl'), header, events);
}

function withPremixChecks(): string {
  const { dir, header, events } = demoWithoutChecks();
  const checks: NewLogEvent[] = [
    { kind: 'premix-mixed', tank: 'MT-2', by: 'AB', time: '2026-11-30T11:00:00Z', note: 'stirred 30 min' },
    {
      kind: 'premix-reading',
      tank: 'MT-2',
      gauge: 'head-10kT',
      reading: '600 Torr',
      pressure_Pa: 600 * TORR,
      minimum_Pa: 621.7 * TORR,
      enough: false,
      by: 'AB',
      time: '2026-11-30T11:02:00Z',
    },
    {
      kind: 'premix-reading',
      tank: 'MT-2',
      gauge: 'head-10kT',
      reading: '1890 Torr',
      pressure_Pa: 1890 * TORR,
      minimum_Pa: 621.7 * TORR,
      enough: true,
      by: 'CD',
      time: '2026-11-30T11:20:00Z',
    },
  ];
  // the checks just before the first fill from the premix (step 3), as the guided fill logs them
  const at = events.findIndex((e) => e.kind === 'reading' && e.step === 3);
  expect(at).toBeGreaterThan(0);
  return rechain(join(dir, 'b1.jsonl'), header, [...events.slice(0, at), ...checks, ...events.slice(at)]);
}

describe("check and the certificate of a stage-2 log list the premix tank's checks", () => {
  let f = '';
  beforeAll(() => {
    f = withPremixChecks();
  });

  it('check (text): each check with who, when and the reading against its minimum, the refused one too', async () => {
    const r = await runCli(['check', f, '--trials', '100000']);
    expect(r.stdout).toContain('Premix tank checks (before the first fill from the premix, as logged)');
    expect(r.stdout).toContain(
      'premix in MT-2 confirmed mixed by AB at 2026-11-30T11:00:00Z (line 4): stirred 30 min',
    );
    expect(r.stdout).toContain(
      'premix tank MT-2 read 600 Torr on head-10kT (600.0000 Torr absolute) by AB at 2026-11-30T11:02:00Z ' +
        '(line 5), against the minimum 621.7000 Torr absolute the batch needs: BELOW the minimum, refused',
    );
    expect(r.stdout).toContain(
      'premix tank MT-2 read 1890 Torr on head-10kT (1890.000 Torr absolute) by CD at 2026-11-30T11:20:00Z ' +
        '(line 6), against the minimum 621.7000 Torr absolute the batch needs: enough',
    );
  });

  it('check --json: premix_checks in log order', async () => {
    const j = JSON.parse((await runCli(['check', f, '--trials', '100000', '--json'])).stdout);
    expect(
      j.premix_checks.map((c: { kind: string; line: number; by: string }) => [c.kind, c.line, c.by]),
    ).toEqual([
      ['mixed', 4, 'AB'],
      ['reading', 5, 'AB'],
      ['reading', 6, 'CD'],
    ]);
    expect(j.premix_checks[1]).toMatchObject({ enough: false, reading: '600 Torr', gauge: 'head-10kT' });
    expect(j.premix_checks[1].minimum_Pa).toBeCloseTo(621.7 * TORR, 6);
    expect(j.premix_checks[2]).toMatchObject({ enough: true, by: 'CD' });
  });

  it('the certificate lists them under its acknowledgements (not "none logged")', async () => {
    const r = await runCli(['label', f, '--trials', '100000']);
    // the certificate's paragraphs wrap at 80 columns: read whole
    const cert = certificateFlowed(r.stdout).slice(certificateFlowed(r.stdout).indexOf('ACKNOWLEDGEMENTS'));
    expect(cert).not.toMatch(/^ACKNOWLEDGEMENTS none logged/);
    expect(cert).toContain('premix in MT-2 confirmed mixed by AB');
    expect(cert).toContain('BELOW the minimum, refused');
    expect(cert).toContain('by CD at 2026-11-30T11:20:00Z (line 6)');
  });

  it('a stage-2 log without such lines has no premix_checks', async () => {
    const j = JSON.parse(
      (await runCli(['check', withoutPremixChecks(), '--trials', '100000', '--json'])).stdout,
    );
    expect(j.premix_checks).toEqual([]);
    // the demo log itself, as the guided fill writes it now, carries them (mixed, then the reading)
    const d = JSON.parse((await runCli(['check', DEMO, '--trials', '100000', '--json'])).stdout);
    expect(d.premix_checks.length).toBe(2);
  });
});
