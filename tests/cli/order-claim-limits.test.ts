// The plan's claim that every intermediate state is non-flammable rests on flammability limits (LFL, UFL,
// LOC), some estimated rather than measured: the claim says so wherever it is made, so that the n-heptane
// plan, whose notes say its UFL in O2 and its LOC are estimated, never states it unqualified. Wording
// only: no computed number is checked here.
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

describe('the order claim on estimated flammability limits', () => {
  it('n-heptane: the order reason qualifies "non-flammable" by the limits used, and the notes name them', async () => {
    const r = await runCli(['plan', 'recipes/nc7h16-o2-ar.yaml']);
    expect(r.code, r.stderr).toBe(0);
    const order = /^Order .*$/m.exec(r.stdout)?.[0] ?? '';
    expect(order).toContain(
      'is non-flammable by the flammability limits used (each estimated one is named in a ' +
        'flammability-data-estimated note) and free of the hazards checked',
    );
    expect(r.stdout).not.toMatch(/is non-flammable and free of the hazards checked/);
    expect(r.stdout).toMatch(/note {4}flammability-data-estimated: .*n-C7H16 \(UFL in O2\)/);
    expect(r.stdout).toMatch(/note {4}flammability-data-estimated: .*n-C7H16 \(LOC = z x LFL\)/);
  });

  it('n-heptane with --order: the safer-order warning qualifies its claim as the order reason does', async () => {
    const r = await runCli(['plan', 'recipes/nc7h16-o2-ar.yaml', '--order', 'n-C7H16,O2,Ar']);
    expect(r.code, r.stderr).toBe(3);
    expect(r.stdout).toMatch(
      /warning safer-order: .*avoids them \(by the order review, every intermediate tank state is non-flammable by the flammability limits used \(each estimated one is named in a flammability-data-estimated note\) and free/,
    );
  });
});

// the qualifier is said only where a limit was estimated: CH4, C2H4 and the natural-gas blend's fuels have
// tabulated LFL, UFL and LOC (no flammability-data-estimated note), so their claim is the plain one
describe('the order claim on tabulated flammability limits', () => {
  it.each(['recipes/ch4-o2-ar-phi1.yaml', 'recipes/c2h4-o2-ar-phi05.yaml', 'recipes/ng-blend-air.yaml'])(
    '%s: "non-flammable" unqualified, no flammability-data-estimated note',
    async (recipe) => {
      const r = await runCli(['plan', recipe]);
      expect(r.stdout).not.toMatch(/flammability-data-estimated/);
      const order = /^Order .*$/m.exec(r.stdout)?.[0] ?? '';
      expect(order).toMatch(/is non-flammable and free of the hazards checked/);
      expect(order).not.toContain('by the flammability limits used');
    },
  );

  it('CH4 with --order: the safer-order warning states its claim unqualified (no limit estimated)', async () => {
    const r = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--order', 'CH4,O2,Ar']);
    expect(r.code, r.stderr).toBe(3);
    const safer = r.stdout.split('\n').find((l) => l.includes('warning safer-order'))!;
    expect(safer).toContain('is non-flammable and free of the hazards checked');
    expect(safer).not.toContain('by the flammability limits used');
    expect(r.stdout).not.toMatch(/flammability-data-estimated/);
  });
});
