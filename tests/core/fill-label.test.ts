// How a fill is named: a premix by every gas it was made to carry, whatever its fraction.
import { describe, expect, it } from 'vitest';
import { fillLabel, premix, premixSource, pureCylinder } from '../../src/core/index.js';

describe('fillLabel: a premix names its oxidizer or fuel however small (our naming rule)', () => {
  it('a first-stage premix of 0.12 % O2 in Ar with a cylinder N2 trace reads Ar+O2, not Ar', () => {
    const p = premixSource({
      id: 'premix-MT-2',
      tank: 'MT-2',
      gases: ['O2', 'Ar'],
      composition: { Ar: 0.99879998, O2: 0.0012, N2: 2e-8 },
      unidentified: 1e-5,
      pressurePa: 3.78e5,
    });
    expect(fillLabel(p)).toBe('Ar+O2');
    // the source's own label follows the same name
    expect(p.label).toBe('Ar+O2 premix in MT-2');
  });

  it('a premix of 50 ppm CH4 in N2 reads N2+CH4 (largest first)', () => {
    const p = premixSource({
      id: 'p',
      tank: 'T',
      gases: ['CH4', 'N2'],
      composition: { N2: 0.99995, CH4: 0.00005 },
      unidentified: 0,
      pressurePa: 1e5,
    });
    expect(fillLabel(p)).toBe('N2+CH4');
  });

  it('a lab premix cylinder is named by every component its profile lists; a pure cylinder by its gas', () => {
    expect(fillLabel(premix({ id: 'AIR', composition: { N2: 0.79, O2: 0.21 } }))).toBe('N2+O2');
    expect(fillLabel(premix({ id: 'MIX', composition: { Ar: 0.995, O2: 0.005 } }))).toBe('Ar+O2');
    const ar = pureCylinder({ id: 'cyl-Ar', species: 'Ar', purity: 0.99999, impurities: { O2: 2e-6 } });
    expect(fillLabel(ar)).toBe('Ar');
  });
});
