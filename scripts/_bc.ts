import { readFileSync } from 'node:fs';
import { bMix, cMix, virialModel } from '../src/core/index.js';
const cases = JSON.parse(readFileSync('/tmp/ref_bc.json', 'utf8'));
for (const c of cases) {
  const m = virialModel(Object.keys(c.x), c.T);
  const B = bMix(m, c.x) * 1e6, C = cMix(m, c.x) * 1e12;
  console.log(c.name, `ours B ${B.toFixed(2)} C ${C.toFixed(0)} | dB*rho ${((B - c.B) * 1e-6 * c.rho).toExponential(2)} dC*rho2 ${((C - c.C) * 1e-12 * c.rho ** 2).toExponential(2)} trunc ${c.Z_trunc_err.toExponential(2)}`);
}
