/**
 * The safety review of every tank state of a fill (after each fill, and the gas
 * already in the tank), and of each fill line: pressure against the tank rating,
 * condensation, flammability, detonability, closed-vessel pressure, compression
 * heating, and known incompatibilities. Findings only: the review never changes
 * the plan.
 */
import type { Fractions } from './composition.js';
import { FUEL_SAFETY, INERT_K } from './data/safety-data.js';
import {
  ACETYLENE_LIMIT_PA,
  DEFAULT_CONDENSATION_FRACTION,
  FLAMMABILITY_DATA_MARGIN,
  INERT_K_FALLBACK,
  N2O_DECOMPOSITION_ABOVE_PA,
  N2O_OXYGEN_EQUIVALENT,
  OXYGEN_ENRICHED_ABOVE,
  PSAT_ESTIMATE_NOTE_ABOVE,
} from './thresholds.js';
import { assessFlammability, blendLimits, type FlammabilityAssessment } from './flammability.js';
import { closedVesselFinding, detonationFinding, equilibriumFlameK } from './explosion-review.js';
import { detonability } from './detonation.js';
import { reviewCompression } from './compression.js';
import { saturationPressure } from './vapour-pressure.js';
import { getSpecies } from './lookup.js';
import { oxygenDemand } from './formula.js';
import type { Finding, FlammabilityNumbers } from './findings.js';

export interface SafetyContext {
  readonly temperatureK: number;
  /** working limit of the tank, Pa absolute; undefined when the rating is unknown */
  readonly workingLimitPa?: number;
  readonly tankId: string;
  /** coldest wetted temperature of tank and lines, K */
  readonly coldestK?: number;
  /** fraction of the saturation pressure a partial pressure may reach (default DEFAULT_CONDENSATION_FRACTION, 0.5) */
  readonly condensationFraction?: number;
}

/** one tank state: after fill `step` (0 = gas already in the tank) */
export interface TankState {
  readonly step: number;
  readonly composition: Fractions;
  readonly pressurePa: number;
  readonly final: boolean;
  /** the temperature it was read at (a recorded fill); absent: the review's (a plan) */
  readonly temperatureK?: number;
}

/** one fill: what enters and from which state to which */
export interface FillEvent {
  readonly step: number;
  readonly sourceId: string;
  readonly sourceComposition: Fractions;
  readonly before?: TankState;
  readonly after: TankState;
}

/**
 * Detonability of a flammable state (a point on a fill's path): published detonation
 * limits where they exist, else the conservative inert rule (`detonability` in
 * detonation.ts, the same decision the state review makes).
 */
export function detonableByRule(
  a: FlammabilityAssessment,
  composition: Fractions,
  _pressurePa: number,
): boolean {
  return a.verdict === 'flammable' && detonability(composition).detonable;
}

function hasOxidizer(y: Fractions): boolean {
  return Object.entries(y).some(([k, v]) => v > 0 && oxygenDemand(getSpecies(k).elements) < 0);
}

function fuelsIn(y: Fractions): string[] {
  return Object.entries(y)
    .filter(([k, v]) => v > 1e-9 && oxygenDemand(getSpecies(k).elements) > 0)
    .map(([k]) => k);
}

/**
 * the numbers of a flammability finding; with the composition and temperature it adds the
 * equilibrium flame temperature
 */
export function flammabilityNumbers(
  a: FlammabilityAssessment,
  pressurePa: number,
  composition?: Fractions,
  temperatureK?: number,
): FlammabilityNumbers {
  const e = a.byEnvelope === a.verdict;
  const t = a.byFlameTemperature === a.verdict;
  return {
    method: e && t ? 'envelope and flame temperature' : e ? 'envelope' : 'flame temperature',
    fuelFraction: a.point.fuel,
    oxygenFraction: a.point.oxygen,
    lfl: a.limits?.lfl,
    loc: a.limits?.loc,
    flameK: a.flameK,
    limitFlameK: a.limitFlameK,
    flameEquilibriumK:
      composition && temperatureK !== undefined && a.flameK !== undefined && a.verdict !== 'non-flammable'
        ? equilibriumFlameK(composition, temperatureK, pressurePa)
        : undefined,
    pressurePa,
    side: a.distance?.side,
    equivalenceRatio: a.distance?.equivalenceRatio,
    fuelOverLfl: a.distance?.fuelOverLfl,
    oxygenOverLoc: a.distance?.oxygenOverLoc,
    uflHere: a.distance?.uflHere,
    fuelOverUfl: a.distance?.fuelOverUfl,
    leanLimitHere: a.distance?.leanLimitHere,
    missingData: a.limits?.missing.length ? true : undefined,
    withinMargin: a.verdict === 'within-margin' ? FLAMMABILITY_DATA_MARGIN : undefined,
    limitsLowerBy: a.verdict === 'within-margin' ? a.distance?.limitsLowerBy : undefined,
    flameRiseShare: a.verdict === 'within-margin' ? a.distance?.flameRiseShare : undefined,
  };
}

/** the hazards of one state, as findings; `detail` 'severity' leaves out the numbers no severity depends on */
export function reviewState(
  s: TankState,
  ctx: SafetyContext,
  detail: 'full' | 'severity' = 'full',
): { findings: Finding[]; flammability: FlammabilityAssessment } {
  const out: Finding[] = [];
  const step = s.step > 0 ? s.step : undefined;
  const a = assessFlammability(s.composition, ctx.temperatureK, s.pressurePa);
  // the equilibrium flame temperature is a number the finding shows, never part of its severity:
  // the order advice and the sequence search, which weigh severities only, leave it out
  const nums =
    detail === 'full'
      ? flammabilityNumbers(a, s.pressurePa, s.composition, ctx.temperatureK)
      : flammabilityNumbers(a, s.pressurePa);
  if (a.verdict === 'flammable') {
    out.push({ severity: 'warning', code: s.final ? 'flammable-mixture' : 'flammable-state', step, ...nums });
    // detonation and closed-vessel pressure: flammable states only (explosion-review.ts)
    const det = detonationFinding(s, ctx.temperatureK, ctx.workingLimitPa, step, detail);
    if (det) out.push(det);
    out.push(closedVesselFinding(s, ctx.temperatureK, ctx.workingLimitPa, step));
  } else if (a.verdict === 'within-margin') {
    // inside the data's uncertainty margin: not shown non-flammable (thresholds.ts)
    out.push({ severity: 'warning', code: 'near-flammable', step, ...nums });
  } else if (a.verdict === 'near-limit') {
    out.push({ severity: 'note', code: 'near-flammable', step, ...nums });
  }
  const y = s.composition;
  if ((y.NO ?? 0) > 0 && (y.O2 ?? 0) > 0)
    out.push({ severity: 'danger', code: 'no-with-o2', step, pressurePa: s.pressurePa });
  const pC2H2 = (y.C2H2 ?? 0) * s.pressurePa;
  if (pC2H2 > ACETYLENE_LIMIT_PA)
    out.push({
      severity: 'danger',
      code: 'acetylene-pressure',
      step,
      partialPa: pC2H2,
      limitPa: ACETYLENE_LIMIT_PA,
      inLine: false,
    });
  const pN2O = (y.N2O ?? 0) * s.pressurePa;
  if (pN2O > N2O_DECOMPOSITION_ABOVE_PA)
    out.push({ severity: 'warning', code: 'n2o-decomposition', step, partialPa: pN2O });
  const xO2 = (y.O2 ?? 0) + N2O_OXYGEN_EQUIVALENT * (y.N2O ?? 0);
  if (xO2 > OXYGEN_ENRICHED_ABOVE)
    out.push({ severity: 'note', code: 'oxygen-enriched', step, oxygenFraction: xO2 });
  // condensation of each species below its critical temperature, at the coldest wetted point: the lab's
  // coldest, or the state's own temperature where it is colder (a fill made colder than the profile says)
  const cold = coldestOf(ctx);
  const frac = ctx.condensationFraction ?? DEFAULT_CONDENSATION_FRACTION;
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    const ps = saturationPressure(k, cold);
    if (!ps) continue;
    const partial = v * s.pressurePa;
    if (partial > frac * ps.pressurePa) {
      out.push({
        severity: partial > ps.pressurePa ? 'danger' : 'warning',
        code: 'condensation',
        step,
        species: k,
        partialPa: partial,
        psatPa: ps.pressurePa,
        fraction: frac,
        coldestK: cold,
        inLine: false,
        method: ps.method,
      });
    }
  }
  return { findings: out, flammability: a };
}

/** the coldest wetted temperature: the lab profile's, or the state's own where that is colder */
function coldestOf(ctx: SafetyContext): number {
  return Math.min(ctx.coldestK ?? ctx.temperatureK, ctx.temperatureK);
}

/** hazards of the fill itself: its line, compression heating of the gas it compresses, oxygen service */
export function reviewFill(e: FillEvent, ctx: SafetyContext): Finding[] {
  const out: Finding[] = [];
  const step = e.step;
  const src = e.sourceComposition;
  const cold = coldestOf(ctx);
  const frac = ctx.condensationFraction ?? DEFAULT_CONDENSATION_FRACTION;
  // the line of a pure vapour or gas holds it at (at least) the pressure the tank reaches
  const main = Object.entries(src).reduce((a, b) => (b[1] > a[1] ? b : a))[0];
  if ((src[main] ?? 0) > 0.5) {
    const ps = saturationPressure(main, cold);
    const linePa = e.after.pressurePa * (src[main] ?? 1);
    if (ps && linePa > frac * ps.pressurePa) {
      out.push({
        severity: linePa > ps.pressurePa ? 'danger' : 'warning',
        code: 'condensation',
        step,
        species: main,
        partialPa: linePa,
        psatPa: ps.pressurePa,
        fraction: frac,
        coldestK: cold,
        inLine: true,
        method: ps.method,
      });
    }
    if (main === 'C2H2' && linePa > ACETYLENE_LIMIT_PA)
      out.push({
        severity: 'danger',
        code: 'acetylene-pressure',
        step,
        partialPa: linePa,
        limitPa: ACETYLENE_LIMIT_PA,
        inLine: true,
      });
  }
  if (hasOxidizer(src)) out.push({ severity: 'note', code: 'oxygen-service', step, source: e.sourceId });
  // compression heating of whatever gas is already in the tank
  out.push(...reviewCompression(e, ctx));
  return out;
}

/** data gaps that make the review less certain: said once per batch */
export function reviewDataGaps(states: readonly TankState[], ctx: SafetyContext): Finding[] {
  const out: Finding[] = [];
  const species = new Set<string>();
  for (const s of states) for (const [k, v] of Object.entries(s.composition)) if (v > 1e-7) species.add(k);
  for (const k of species) {
    const d = oxygenDemand(getSpecies(k).elements);
    if (d > 0 && !FUEL_SAFETY.has(k))
      out.push({ severity: 'warning', code: 'no-flammability-data', species: k });
    if (d === 0 && !INERT_K.has(k) && states.some((s) => fuelsIn(s.composition).length > 0)) {
      out.push({ severity: 'note', code: 'inert-coefficient-unknown', species: k, used: INERT_K_FALLBACK });
    }
    const ps = saturationPressure(k, ctx.coldestK ?? ctx.temperatureK);
    if (ps && (ps.method === 'lee-kesler' || ps.method === 'antoine-extrapolated')) {
      // only worth saying where the species is present in more than trace amounts
      if (
        states.some((s) => (s.composition[k] ?? 0) * s.pressurePa > PSAT_ESTIMATE_NOTE_ABOVE * ps.pressurePa)
      ) {
        out.push({
          severity: 'note',
          code: 'psat-estimated',
          species: k,
          method: ps.method,
          coldestK: ctx.coldestK ?? ctx.temperatureK,
        });
      }
    }
  }
  const fuels = [...species].filter(
    (k) => FUEL_SAFETY.has(k) && states.some((st) => (st.composition[k] ?? 0) > 1e-4),
  );
  for (const k of fuels) {
    // an autoignition temperature not on file (data/coverage.ts): the compression check cannot judge this fuel
    if (FUEL_SAFETY.get(k)?.ait === undefined)
      out.push({ severity: 'warning', code: 'no-autoignition-data', species: k });
    for (const what of blendLimits({ [k]: 1 }, 298.15, 101325).estimated)
      out.push({ severity: 'note', code: 'flammability-data-estimated', what });
  }
  if (
    ctx.coldestK === undefined &&
    [...species].some((k) => saturationPressure(k, ctx.temperatureK) !== undefined)
  ) {
    out.push({ severity: 'note', code: 'coldest-temperature-assumed', temperatureK: ctx.temperatureK });
  }
  return out;
}

/**
 * The context a state is judged in: at the temperature it was read at where it has one (the fill as
 * recorded), else the review's own. The coldest wall stays the review's (its coldestK, else its
 * temperature: the recorded review gives its coldest reading), so condensation is never judged warmer.
 */
export function stateContext(ctx: SafetyContext, s: TankState): SafetyContext {
  if (s.temperatureK === undefined) return ctx;
  return { ...ctx, temperatureK: s.temperatureK, coldestK: ctx.coldestK ?? ctx.temperatureK };
}

/**
 * The context a fill and its path are judged in: between two states read at different temperatures,
 * at the warmer of the two. The conservative choice: the flammable region only widens as the gas
 * warms, and compression heating starts from a warmer gas (the path's temperature between the two
 * readings is not known). States without a temperature: the review's own.
 */
export function fillContext(ctx: SafetyContext, e: FillEvent): SafetyContext {
  const ends = [e.before?.temperatureK, e.after.temperatureK].filter((t): t is number => t !== undefined);
  if (!ends.length) return ctx;
  return { ...ctx, temperatureK: Math.max(...ends), coldestK: ctx.coldestK ?? ctx.temperatureK };
}

/** the whole review: every state, every fill, the data gaps */
export function reviewFillSequence(
  states: readonly TankState[],
  fills: readonly FillEvent[],
  ctx: SafetyContext,
): Finding[] {
  const out: Finding[] = [];
  if (ctx.workingLimitPa === undefined)
    out.push({ severity: 'warning', code: 'tank-rating-unknown', tank: ctx.tankId });
  // a vapour too close to saturation stays so in every later state: said once, at the first state it happens
  const condensing = new Set<string>();
  for (const s of states) {
    for (const f of reviewState(s, stateContext(ctx, s)).findings) {
      if (f.code === 'condensation') {
        if (condensing.has(f.species)) continue;
        condensing.add(f.species);
      }
      out.push(f);
    }
  }
  for (const f of fills) out.push(...reviewFill(f, fillContext(ctx, f)));
  out.push(...reviewDataGaps(states, ctx));
  return out;
}
