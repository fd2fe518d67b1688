import { describe, expect, it } from 'vitest';
import { FUEL_SAFETY, SOURCES } from '../../src/core/index.js';
import { runCli } from '../helpers.js';

describe('species: fire data from memory or estimated is named', () => {
  it('C2H4 names its UFL in O2 (Zabetakis 1965, from memory) and lists both autoignition temperatures (NFPA 497 763.15 K, IEC 60079-20-1 713.15 K)', async () => {
    const r = await runCli(['species', 'C2H4']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Still from memory[^\n]*UFL in O2 80\.0 vol % \(zabetakis-1965-memory\)/);
    expect(r.stdout).toMatch(/autoignition temperature \(lower, used\)\s+713\s+K\s+iec-60079-20-1-2010/);
    expect(r.stdout).toMatch(/autoignition temperature\s+763\s+K\s+nfpa-497-2008/);
  });
  it('CH4 has nothing from memory among its limits (LFL/UFL NFPA 497 and IEC, UFL in O2 Coward & Jones, LOC ASTM E2079, AIT NFPA/IEC)', async () => {
    const r = await runCli(['species', 'CH4']);
    expect(r.stdout).not.toContain('Still from memory');
    expect(r.stdout).toContain('coward-jones-1952');
  });
  it('n-heptane says its UFL in O2 and LOC are estimated; acetylene names its LOC of 0 as from memory', async () => {
    expect((await runCli(['species', 'n-C7H16'])).stdout).toContain(
      'Estimated, no published value on file: n-C7H16 (UFL in O2); n-C7H16 (LOC = z x LFL)',
    );
    expect((await runCli(['species', 'C2H2'])).stdout).toMatch(
      /Still from memory[^\n]*limiting O2 concentration \(N2\) 0\.00 vol % \(acetylene-practice\)/,
    );
  });
  it('detonation limits are listed with their source and marked from memory (Kuchta 1985, USBM Bulletin 680; recalled), and a fuel without limits in air names the conservative rule', async () => {
    const c2h4 = (await runCli(['species', 'C2H4'])).stdout;
    expect(c2h4).toMatch(
      /Detonation limits: in air 3\.30-14\.7 vol % \(fuel-air-detonability-memory\); in O2 3\.00-80\.0 vol % \(kuchta-1985-memory\)\. These are from memory/,
    );
    const ch4 = (await runCli(['species', 'CH4'])).stdout;
    expect(ch4).toMatch(/Detonation limits: in O2 8\.30-55\.0 vol % \(kuchta-1985-memory\)/);
    expect(ch4).toMatch(/No detonation limits in air on file: .*our conservative rule/);
  });
  it('the README lists every limit still from memory (the table and the README agree)', async () => {
    const { readFileSync } = await import('node:fs');
    const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
    for (const [k, r] of FUEL_SAFETY) {
      for (const [what, v] of [
        ['UFL in O2', r.uflO2],
        ['LOC', r.loc],
      ] as const) {
        if (v && SOURCES.get(v.source)!.quality === 'from-memory')
          expect(readme, `${k} ${what}`).toMatch(new RegExp(`${k.replace(/[-]/g, '\\-')} ${what}`));
      }
    }
  });
});
