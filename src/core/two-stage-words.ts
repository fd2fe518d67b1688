/**
 * The wording of two-stage preparation: its findings (the premix tank's falling pressure, the
 * proposal of a premix) and its refusals. Kept beside findings.ts and messages.ts so that both
 * stay short; they spread these in.
 */
import type { Finding, PressureFormatter } from './findings.js';
import type { Problem } from './problems.js';

type Of<C extends Finding['code']> = Finding & { readonly code: C };

/** a relative size in per cent, two significant digits */
const rel = (x: number) => `${Number((x * 100).toPrecision(2)).toString()} %`;

function runsLow(f: Of<'premix-runs-low'>, p: PressureFormatter): string {
  const after = f.endPa > 0 ? `falls to ${p(f.endPa)}` : 'runs empty';
  return (
    `the premix tank ${f.tank}, filled to ${p(f.startPa)}, ${after} once it has delivered ` +
    `${f.deliveredMol.toPrecision(3)} mol, but this charge must reach ${p(f.targetPa)} in the batch ` +
    `tank (and gas flows only while the premix tank is higher; ${p(f.requiredPa)} leaves a 10 % margin): ` +
    `make more premix (a higher premix pressure within the tank's working limit) or a smaller batch`
  );
}

function coolsLow(f: Of<'premix-cools-low'>, p: PressureFormatter): string {
  return (
    `delivered fast, the gas left in the premix tank ${f.tank} cools by its own expansion to about ` +
    `${(f.endK ?? 0).toFixed(0)} K and ${p(f.endPa)}, below the ${p(f.requiredPa)} this charge needs ` +
    `(target ${p(f.targetPa)} plus 10 %); settled it is high enough: deliver slowly, and let the ` +
    `premix tank warm back if the flow stops`
  );
}

function proposed(f: Of<'two-stage-proposed'>): string {
  const warned = f.warnings.length
    ? `; its plan carries warning${f.warnings.length > 1 ? 's' : ''} (${f.warnings.join(', ')}): ` +
      `read ${f.warnings.length > 1 ? 'them' : 'it'} in the two-stage plan before choosing it`
    : '';
  const head =
    `a premix of ${f.premix} in ${f.premixTank} first would give U of x(${f.species}) ` +
    `${rel(f.twoStageU)} instead of ${rel(f.singleU)}${warned}`;
  // a premix tank takes no fill order (stage-order): the two-stage plan chooses the batch's order
  const why =
    'a premix tank takes no fill order (the two-stage plan chooses the batch order around its premix)';
  if (f.recipeOrder)
    return (
      `${head}; no command is given, since ${f.recipeOrder.file} fixes the fill order ` +
      `(order: ${f.recipeOrder.order}) and ${why}: take order: out of a copy of the recipe, then ` +
      `plan that copy with --premix-tank ${f.premixTank}`
    );
  const left = f.orderLeftOut ? ` (--order ${f.orderLeftOut} left out: ${why})` : '';
  return `${head}: ${f.command ?? ''}${left}`;
}

export const TWO_STAGE_WORDING = {
  'premix-runs-low': runsLow,
  'premix-cools-low': coolsLow,
  'two-stage-proposed': proposed,
} as const;

/** why a two-stage plan was refused */
export function describeTwoStageProblem(
  p: Extract<Problem, { code: 'two-stage-refused' }>,
  describe: (q: Problem) => string,
): string {
  switch (p.kind) {
    case 'same-tank':
      return (
        `the premix must be made in another tank than the batch (both are ${p.tank}); ` +
        'name a second tank of the lab profile'
      );
    case 'no-diluent':
      return 'the design has no diluent to make a premix in; a two-stage preparation needs one';
    case 'no-plan':
      return (
        `none of the ${p.tried} premix choices tried could be planned` +
        (p.cause ? `; the first refusal: ${describe(p.cause)}` : '')
      );
  }
}
