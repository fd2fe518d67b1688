import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  ACETYLENE_LIMIT_PA,
  DETONABLE_INERT_BELOW,
  getSource,
  MARGINS,
  OXYGEN_COMPRESSION_LIMIT_K,
  THRESHOLDS,
} from '../../src/core/index.js';

// the one home of the review's thresholds (src/core/thresholds.ts): every entry names its basis
describe('thresholds: every entry carries its basis', () => {
  const entries = Object.entries(THRESHOLDS);

  it('has the thresholds the review applies', () => {
    for (const name of [
      'n2oDecompositionAbovePa',
      'n2oOxygenEquivalent',
      'oxygenEnrichedAbove',
      'oxygenCompressionK',
      'detonableInertBelow',
      'nfpa69LflFraction',
      'nfpa69LocOffset',
      'nfpa69LocFractionLow',
      'nearLimitFlameShare',
    ])
      expect(Object.keys(THRESHOLDS), name).toContain(name);
  });

  it('every entry has a finite value, a unit, a basis and a note of what it decides', () => {
    for (const [name, t] of entries) {
      expect(Number.isFinite(t.value), name).toBe(true);
      expect(t.unit.length, `${name}: unit`).toBeGreaterThan(0);
      expect(['published', 'from-memory', 'exact', 'common-practice', 'our-choice'], name).toContain(t.basis);
      expect(t.note.trim().length, `${name}: note`).toBeGreaterThan(20);
    }
  });

  it('a published or recalled value names a source key of the bibliography, of the matching quality', () => {
    for (const [name, t] of entries) {
      const key = 'source' in t ? t.source : undefined;
      if (t.basis === 'published' || t.basis === 'from-memory')
        expect(key, `${name} (${t.basis}) needs a source key`).toBeTruthy();
      if (key === undefined) continue;
      const quality = getSource(key).quality;
      if (t.basis === 'from-memory') expect(quality, `${name}: ${key}`).toBe('from-memory');
      if (t.basis === 'published') expect(quality, `${name}: ${key}`).not.toBe('from-memory');
    }
  });

  it('the named constants the modules apply are the table values', () => {
    expect(OXYGEN_COMPRESSION_LIMIT_K).toBe(THRESHOLDS.oxygenCompressionK.value);
    expect(DETONABLE_INERT_BELOW).toBe(THRESHOLDS.detonableInertBelow.value);
    expect(MARGINS.lflFraction).toBe(THRESHOLDS.nfpa69LflFraction.value);
    expect(MARGINS.locOffset).toBe(THRESHOLDS.nfpa69LocOffset.value);
    expect(MARGINS.locFractionLow).toBe(THRESHOLDS.nfpa69LocFractionLow.value);
    // 15 psig over one standard atmosphere: 101325 + 15 x 6894.757 Pa (psi exact by the
    // international pound and inch; NIST SP 811), within 0.01 Pa
    expect(Math.abs(ACETYLENE_LIMIT_PA - (101325 + 15 * 6894.757293168))).toBeLessThan(0.01);
  });

  it('no core module writes these thresholds as bare literals any more', () => {
    // the distinctive values: 0.235 (oxygen-enriched), 473.15 (oxygen compression), 101325 / 760 (Torr)
    const patterns = [/\b0\.235\b/, /\b473\.15\b/, /101325\s*\/\s*760/];
    const files = (dir: string): string[] =>
      readdirSync(dir, { withFileTypes: true }).flatMap((d) =>
        d.isDirectory() ? files(join(dir, d.name)) : d.name.endsWith('.ts') ? [join(dir, d.name)] : [],
      );
    const home = new Set(['src/core/thresholds.ts', 'src/core/constants.ts']);
    for (const f of files('src').filter((f) => !home.has(f.replace(/\\/g, '/')))) {
      const code = readFileSync(f, 'utf8')
        .split('\n')
        .filter((l) => !/^\s*(\*|\/\/|\/\*)/.test(l))
        .join('\n');
      for (const p of patterns) expect(p.test(code), `${f} writes ${p.source}`).toBe(false);
    }
  });
});
