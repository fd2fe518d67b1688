/**
 * Our own mathjs instance, with Torr and psi redefined exactly. In the built command this
 * module is a separate file (dist/units.cjs) required only when a unit outside the fast
 * table turns up, so that mathjs costs nothing at start-up (scripts/build.mjs).
 */
import { create, all } from 'mathjs';

export type MathJs = ReturnType<typeof create>;

export function createMath(): MathJs {
  const math = create(all, {});
  // 1 Torr = 1/760 atm exactly; 1 psi = 1 lbf/in^2 exactly (0.45359237 kg x 9.80665 m/s^2 / 0.0254^2 m^2)
  math.createUnit(
    { torr: { definition: '0.001315789473684210526315789 atm', aliases: ['Torr'] } },
    { override: true },
  );
  math.createUnit({ psi: { definition: '1 lbf/in^2' } }, { override: true });
  math.createUnit({ mTorr: { definition: '0.001 torr', aliases: ['mtorr'] } }, { override: true });
  math.createUnit({ kTorr: { definition: '1000 torr', aliases: ['ktorr'] } }, { override: true });
  return math;
}
