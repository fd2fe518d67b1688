// Prints the cross-B rule's calibration on the committed table (run by scripts/reference/gen_cross_virial.py
// after it writes the table, and by hand: npx tsx scripts/cross-rule.ts).
import { calibrate } from './cross-rule-lib.js';
import { VIRIAL_U } from '../src/core/index.js';
import { CROSS_RULE_KIJ } from '../src/core/virial.js';

const cal = calibrate(VIRIAL_U.cross.absolute * 1e6);
console.log(
  `cross-B rule fitted on ${cal.pairs} pairs: k_ij + ${cal.fit.general.toFixed(4)} ` +
    `(+ ${cal.fit.co2.toFixed(4)} with CO2); committed ${CROSS_RULE_KIJ.general} / ${CROSS_RULE_KIJ.co2}`,
);
console.log(
  `relative u calibrated ${(cal.relative * 100).toFixed(2)} % (stated ${VIRIAL_U.cross.relative * 100} %); ` +
    `leave-one-out coverage within 2u ${(cal.looCovered * 100).toFixed(1)} % ` +
    `(missed: ${cal.looMissed.join(', ') || 'none'})`,
);
if (cal.looCovered < 0.95)
  console.log('LEAVE-ONE-OUT COVERAGE BELOW 95 %: recalibrate VIRIAL_U.cross / CROSS_RULE_KIJ');
