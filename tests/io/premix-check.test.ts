// A premix named by its batch log: the log's re-checked composition and budget as the batch's source;
// a batch log that names its premix log re-checks it, and refuses a missing or changed one.
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { describeProblem, evaluateUncertainty, ProblemError } from '../../src/core/index.js';
import { appendEvent, readLog } from '../../src/io/batch-log.js';
import { checkLog, logModelInput } from '../../src/io/check.js';
import { readPremixLog } from '../../src/io/premix-check.js';

const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const BATCH = 'batches/demo-ch4-phi1-from-premix.jsonl';

describe('readPremixLog: a logged premix tank as a premix source', () => {
  const rec = readPremixLog(PREMIX, resolve(PREMIX), undefined);
  const log = readLog(PREMIX);
  const h = log.header;
  const model = logModelInput(
    log,
    { pressurePa: h.barometer.pressure_Pa, uPa: h.barometer.u_Pa },
    undefined,
    { trials: 0, seed: 0 },
  );
  const recheck = evaluateUncertainty(model.readings, model.settings, model.diluent, model.initial);

  it("its composition is the log's re-checked composition, scaled to 1 - unidentified (identity, 1e-12)", () => {
    for (const k of recheck.species)
      expect(rec.source.composition[k]).toBeCloseTo(
        recheck.composition[k].value * (1 - recheck.unidentified),
        12,
      );
    expect(rec.source.unidentified).toBeCloseTo(recheck.unidentified, 15);
    expect(rec.source.kind).toBe('premix');
    // the two-stage plan's label of a premix in MT-2: an order names it so
    expect(rec.source.id).toBe('premix-MT-2');
    expect(rec.lastEntrySha256).toBe(log.lastLink);
  });

  it("its composition terms carry the re-check's u of every fraction (identity: sum of (c u)^2, 1e-9)", () => {
    for (const k of ['O2', 'Ar']) {
      const u2 = (rec.source.compositionTerms ?? []).reduce((a, t) => {
        const ut = t.dist === 'rectangular' ? t.scale / Math.sqrt(3) : t.scale;
        return a + (t.sensitivity[k] * ut) ** 2;
      }, 0);
      const expected = recheck.composition[k].u * (1 - recheck.unidentified);
      expect(Math.abs(Math.sqrt(u2) / expected - 1)).toBeLessThan(1e-9);
    }
  });

  it('its gauge span and thermometer offset say which instrument they are (shared with a batch of the same lab)', () => {
    const shared = (rec.source.compositionTerms ?? []).map((t) => t.shared).filter(Boolean);
    expect(shared).toContainEqual({ kind: 'span', gauge: 'head-10kT' });
    expect(shared).toContainEqual({ kind: 'thermometer' });
  });
});

describe('check of a batch log that names its premix log', () => {
  const dir = mkdtempSync(join(tmpdir(), 'mw-premixlog-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const copy = () => {
    copyFileSync(PREMIX, join(dir, 'demo-premix-o2-ar-mt2.jsonl'));
    copyFileSync(BATCH, join(dir, 'batch.jsonl'));
  };
  const refusal = async (): Promise<ProblemError> => {
    try {
      await checkLog(readLog(join(dir, 'batch.jsonl')), { trials: 0, seed: 1 });
    } catch (e) {
      if (e instanceof ProblemError) return e;
      throw e;
    }
    throw new Error('not refused');
  };

  it('re-checks the premix log and reports it; the batch budget holds the premix inputs', async () => {
    const r = await checkLog(readLog(BATCH), { trials: 0, seed: 1 });
    expect(r.premixLogs?.map((p) => p.id)).toEqual(['demo-premix-o2-ar-mt2']);
    expect(r.result.components.some((c) => c.about.kind === 'source-composition')).toBe(true);
    // the same instrument (head-10kT's span, the thermometer) is one input of both stages: no
    // premix component of that name is left
    expect(r.result.components.filter((c) => c.name === 'premix-MT-2: span of head-10kT')).toEqual([]);
  });

  it('refuses a missing premix log (premix-log-refused, unreadable), naming it', async () => {
    copy();
    rmSync(join(dir, 'demo-premix-o2-ar-mt2.jsonl'));
    const e = await refusal();
    expect(e.problem.code).toBe('premix-log-refused');
    if (e.problem.code === 'premix-log-refused') expect(e.problem.cause.kind).toBe('unreadable');
    expect(describeProblem(e.problem)).toContain('demo-premix-o2-ar-mt2.jsonl');
  });

  it('refuses a premix log changed since the batch log recorded it (hash of its last entry)', async () => {
    copy();
    const f = join(dir, 'demo-premix-o2-ar-mt2.jsonl');
    // a barometer reading appended after the batch was filled: a new last entry, chained as the tool writes it
    appendEvent(f, {
      kind: 'barometer',
      reading: '752.0 Torr',
      pressure_Pa: 752 * (101325 / 760),
      by: 'QX',
      time: '2026-12-01T08:00:00Z',
    });
    const e = await refusal();
    expect(e.problem.code).toBe('premix-log-refused');
    if (e.problem.code === 'premix-log-refused') expect(e.problem.cause.kind).toBe('changed');
    expect(describeProblem(e.problem)).toMatch(/has changed since the batch log recorded it/);
  });
});
