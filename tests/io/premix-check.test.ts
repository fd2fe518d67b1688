// A premix named by its batch log: the log's re-checked composition and budget as the batch's source.
import { describe, expect, it } from 'vitest';
import { evaluateUncertainty } from '../../src/core/index.js';
import { readLog } from '../../src/io/batch-log.js';
import { logModelInput } from '../../src/io/check.js';
import { premixSourceFromLog } from '../../src/io/premix-check.js';

const LOG = 'batches/demo-ch4-phi1-ar98.jsonl';

describe('premixSourceFromLog: a logged tank as a premix source', () => {
  const source = premixSourceFromLog(LOG);
  const log = readLog(LOG);
  const h = log.header;
  const model = logModelInput(
    log,
    {
      pressurePa: log.barometer?.pressure_Pa ?? h.barometer.pressure_Pa,
      uPa: log.barometer?.u_Pa ?? h.barometer.u_Pa,
    },
    undefined,
    { trials: 0, seed: 0 },
  );
  const recheck = evaluateUncertainty(model.readings, model.settings, model.diluent, model.initial);

  it("its composition is the log's re-checked composition, scaled to 1 - unidentified (identity, 1e-12)", () => {
    for (const k of recheck.species)
      expect(source.composition[k]).toBeCloseTo(
        recheck.composition[k].value * (1 - recheck.unidentified),
        12,
      );
    expect(source.unidentified).toBeCloseTo(recheck.unidentified, 15);
    expect(source.kind).toBe('premix');
    expect(source.id).toBe(`premix-${h.id}`);
  });

  it("its composition terms carry the re-check's u of every fraction (identity: sum of (c u)^2, 1e-9)", () => {
    for (const k of ['CH4', 'O2', 'Ar']) {
      const u2 = (source.compositionTerms ?? []).reduce((a, t) => {
        const ut = t.dist === 'rectangular' ? t.scale / Math.sqrt(3) : t.scale;
        return a + (t.sensitivity[k] * ut) ** 2;
      }, 0);
      const expected = recheck.composition[k].u * (1 - recheck.unidentified);
      expect(Math.abs(Math.sqrt(u2) / expected - 1)).toBeLessThan(1e-9);
    }
  });
});
