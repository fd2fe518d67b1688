/** mixwright ready: mixing time and contamination of a filled tank, as text and JSON. */
import type { Contamination, DrawDown, FractionAgainstTolerance, MixingEstimate } from '../core/index.js';
import { fixedSig } from './format.js';
import { TORR_PA } from '../core/index.js';
import { describeFinding } from '../core/index.js';

export interface ReadyReport {
  readonly id: string;
  readonly tank: string;
  readonly heightM: number;
  readonly pressurePa: number;
  readonly temperatureK: number;
  readonly mixing: MixingEstimate;
  readonly contamination: Contamination;
  /** the ambient pressure the in-leak is driven by (the barometer), Pa */
  readonly atmosphericPa: number;
  /** the batch drawn down by its experiments (a reactor known), else undefined */
  readonly drawDown?: DrawDown;
  /**
   * the air the last experiment draws against the recipe's tolerance: the design fraction furthest
   * off, spread evenly and held at the lowest pressure (undefined: no draw-down, or no design fraction)
   */
  readonly drawDownTolerance?: {
    readonly relative: number;
    readonly absolute: number;
    readonly evenly?: FractionAgainstTolerance;
    readonly held?: FractionAgainstTolerance;
  };
  readonly reactor?: string;
  readonly days: number;
  readonly leakRatePaPerS: number;
  readonly baseVacuumPa: number;
  readonly notes: readonly string[];
}

export function duration(s: number): string {
  if (s < 90) return `${s.toFixed(0)} s`;
  if (s < 5400) return `${(s / 60).toFixed(0)} min`;
  if (s < 2 * 86400) return `${(s / 3600).toFixed(1)} h`;
  return `${(s / 86400).toFixed(1)} days`;
}

export function readyToText(r: ReadyReport): string {
  const out: string[] = [];
  const m = r.mixing;
  out.push(
    `Readiness  ${r.id}   (tank ${r.tank}, ${fixedSig(r.pressurePa / TORR_PA, 5)} ` +
      `Torr, ${(r.temperatureK - 273.15).toFixed(1)} degC)`,
    '',
  );
  out.push('Mixing');
  if (m.pair) {
    const cm2 = (v?: number) => (v === undefined ? '-' : `${fixedSig(v * 1e4, 3)} cm2/s`);
    out.push(
      `  slowest pair ${m.pair.a}-${m.pair.b}: D = ${cm2(m.pair.fullerM2s)} (Fuller), ` +
        `${cm2(m.pair.chapmanEnskogM2s)} (Chapman-Enskog) at the tank pressure`,
    );
    out.push(
      `  by diffusion alone over the tank height ${fixedSig(r.heightM * 100, 3)} ` +
        `cm: ${duration(m.to1PercentS!)} to 1 %, ${duration(m.to01PercentS!)} to ` +
        `0.1 % residual non-uniformity`,
    );
  }
  // transport data not on file: said, never dropped from the slowest pair in silence
  for (const f of m.findings) out.push(`  ${f.severity}: ${describeFinding(f, (pa) => `${pa} Pa`)}`);
  if (m.stirred) {
    out.push(
      '  the tank is stirred: its mixing is set by the stirrer flow and takes minutes ' +
        '(common practice: run it 15-30 min); the diffusion times above are the unstirred bound',
    );
  } else {
    out.push(
      '  not stirred: wait at least the 0.1 % time before the first use; a heavy ' +
        'fuel layered at the bottom mixes slower still',
    );
  }
  const c = r.contamination;
  out.push('', 'Contamination');
  out.push(
    `  residual gas from the base vacuum ${fixedSig(r.baseVacuumPa / TORR_PA, 3)} ` +
      `Torr: ${fixedSig(c.residualFraction * 1e6, 3)} ppm of the batch (taken as air)`,
  );
  if (c.aboveAmbient) out.push(...aboveAmbientLines(r));
  if (!c.aboveAmbient) {
    out.push(
      `  air leaking in at ${fixedSig((r.leakRatePaPerS * 60) / TORR_PA, 3)} ` +
        `Torr/min (under vacuum), scaled by the pressure difference: ${fixedSig(c.ingressPerDay * 1e6, 3)} ` +
        `ppm of the batch per day, ${fixedSig(c.o2PerDay * 1e6, 3)} ppm O2 per day`,
    );
  }
  out.push(...drawDownLines(r));
  if (c.phiStart !== undefined && c.phiAfter !== undefined) {
    const drift =
      c.phiDriftPerDay !== undefined ? ` (${(c.phiDriftPerDay * 100).toPrecision(2)} % per day)` : '';
    // above ambient as filled: the phi of the full tank; drawn below ambient it drifts (above)
    const full = r.drawDown?.belowFrom !== undefined ? ' in the full tank' : '';
    const maybe = c.aboveAmbient && !r.drawDown ? ' while it stays above ambient' : '';
    out.push(
      `  phi ${c.phiStart.toFixed(5)} at the start, ${c.phiAfter.toFixed(5)} after ` +
        `${daysText(r.days)}${full}${maybe}${drift}`,
    );
  }
  for (const n of r.notes) out.push(`note: ${n}`);
  return out.join('\n') + '\n';
}

const torr = (pa: number) => `${fixedSig(pa / TORR_PA, 4)} Torr`;
const daysText = (d: number) => `${d} day${d === 1 ? '' : 's'}`;
const pctOf = (x: number) => `${fixedSig(x * 100, 2)} %`;

/**
 * A tank above ambient as filled: air does not leak in while it stays so; how long it does, in
 * drawDownLines (a reactor known), else said to be unknown.
 */
function aboveAmbientLines(r: ReadyReport): string[] {
  const atm = torr(r.atmosphericPa);
  const d = r.drawDown;
  if (!d)
    return [
      `  as filled the tank is above ambient pressure (${atm}): air does not leak in while it stays so ` +
        '(gas leaks out, the pressure falls); drawn below ambient in use, air leaks in (no reactor in ' +
        'the lab profile to say when: give --pressure with the lowest tank pressure for the rate there)',
    ];
  if (!d.belowFrom)
    return [
      `  the tank stays above ambient pressure (${atm}) down to its last experiment in ${r.reactor} ` +
        `(${torr(d.lowestPa)} before it): air does not leak in (gas leaks out; the composition keeps, ` +
        'the pressure falls)',
    ];
  return [
    `  as filled the tank is above ambient pressure (${atm}): air does not leak in while it stays so ` +
      '(gas leaks out, the pressure falls)',
  ];
}

/**
 * Below ambient as its experiments draw it down: from which experiment, the in-leak at the lowest
 * pressure, and the air (and phi) the last experiment draws, spread evenly over the storage time and at most.
 */
function drawDownLines(r: ReadyReport): string[] {
  const d = r.drawDown;
  if (!d?.belowFrom) return [];
  const o2 =
    d.o2ShareAddedPerDayAtLowest !== undefined
      ? ` (${pctOf(d.o2ShareAddedPerDayAtLowest)} of the batch's O2 per day)`
      : '';
  const phi = (s: DrawDown['evenly']) => (s.phi !== undefined ? `, phi ${s.phi.toFixed(5)}` : '');
  const from =
    d.belowFrom.experiment === 1
      ? `in use its ${d.experiments} experiments in ${r.reactor} draw it further below ambient`
      : `in use it is drawn below ambient: from experiment ${d.belowFrom.experiment} of ${d.experiments} ` +
        `in ${r.reactor} (the tank at ${torr(d.belowFrom.pressurePa)} before it) air leaks in`;
  return [
    `  ${from}; before the last experiment, at ${torr(d.lowestPa)}, ` +
      `${fixedSig(d.ingressPerDayAtLowest * 1e6, 3)} ppm of the batch per day${o2}`,
    `  air the last experiment draws: ${pctOf(d.evenly.airFraction)}${phi(d.evenly)} with the ` +
      `${d.experiments} experiments spread evenly over ${daysText(r.days)}; at most ` +
      `${pctOf(d.heldAtLowest.airFraction)}${phi(d.heldAtLowest)} if the tank sits at ${torr(d.lowestPa)} ` +
      `for all ${daysText(r.days)} (below ambient the composition does not keep: keep the storage short ` +
      'once the tank is drawn down)',
    ...toleranceLines(r),
  ];
}

/** "O2 5.8 % above its design fraction" */
function offWords(f: FractionAgainstTolerance): string {
  const rel = Math.abs(f.deviation) / f.design;
  return `${f.species} ${fixedSig(rel * 100, 2)} % ${f.deviation >= 0 ? 'above' : 'below'} its design fraction`;
}

/**
 * the air the last experiment draws set against the recipe's tolerance, as computed: the design fraction
 * furthest off, spread evenly and at most; within only where |deviation| <= tolerance
 */
function toleranceLines(r: ReadyReport): string[] {
  const t = r.drawDownTolerance;
  if (!t?.evenly || !t.held) return [];
  const tol =
    `${fixedSig(t.relative * 100, 2)} % relative` +
    (t.absolute > 0 ? `, at least ${t.absolute} absolute` : '');
  const judged = (f: FractionAgainstTolerance) =>
    f.within ? 'within the tolerance' : 'BEYOND the tolerance';
  return [
    `  against the recipe's tolerance (each mole fraction within ${tol}), the planned batch with that air: ` +
      `spread evenly, ${offWords(t.evenly)}, ${judged(t.evenly)}; at most, ${offWords(t.held)}, ` +
      `${judged(t.held)} (the air alone: the fill's own deviation and uncertainty come on top, \`check\`)`,
  ];
}

export function readyToJson(r: ReadyReport, version: string): object {
  return {
    tool: 'mixwright',
    version,
    kind: 'ready',
    id: r.id,
    tank: r.tank,
    height_m: r.heightM,
    pressure_Pa: r.pressurePa,
    temperature_K: r.temperatureK,
    mixing: {
      stirred: r.mixing.stirred,
      slowest_pair: r.mixing.pair ? [r.mixing.pair.a, r.mixing.pair.b] : null,
      D_fuller_m2_per_s: r.mixing.pair?.fullerM2s ?? null,
      D_chapman_enskog_m2_per_s: r.mixing.pair?.chapmanEnskogM2s ?? null,
      diffusion_to_1pct_s: r.mixing.to1PercentS ?? null,
      diffusion_to_0_1pct_s: r.mixing.to01PercentS ?? null,
      findings: r.mixing.findings.map((f) => ({ ...f, message: describeFinding(f, (pa) => `${pa} Pa`) })),
    },
    contamination: {
      base_vacuum_Pa: r.baseVacuumPa,
      leak_rate_Pa_per_s: r.leakRatePaPerS,
      residual_fraction: r.contamination.residualFraction,
      ingress_fraction_per_day: r.contamination.ingressPerDay,
      o2_fraction_per_day: r.contamination.o2PerDay,
      phi_start: r.contamination.phiStart ?? null,
      phi_after: r.contamination.phiAfter ?? null,
      phi_drift_per_day: r.contamination.phiDriftPerDay ?? null,
      days: r.days,
      above_ambient: r.contamination.aboveAmbient,
      ambient_Pa: r.atmosphericPa,
    },
    draw_down: r.drawDown
      ? {
          reactor: r.reactor ?? null,
          experiments: r.drawDown.experiments,
          below_ambient_from_experiment: r.drawDown.belowFrom?.experiment ?? null,
          below_ambient_from_Pa: r.drawDown.belowFrom?.pressurePa ?? null,
          lowest_Pa: r.drawDown.lowestPa,
          ingress_fraction_per_day_at_lowest: r.drawDown.ingressPerDayAtLowest,
          o2_share_added_per_day_at_lowest: r.drawDown.o2ShareAddedPerDayAtLowest ?? null,
          evenly_air_fraction: r.drawDown.evenly.airFraction,
          evenly_phi: r.drawDown.evenly.phi ?? null,
          held_at_lowest_air_fraction: r.drawDown.heldAtLowest.airFraction,
          held_at_lowest_phi: r.drawDown.heldAtLowest.phi ?? null,
          // the design fraction furthest off its design value in its tolerance, with that air (null: none)
          evenly_worst_against_tolerance: toleranceJson(r.drawDownTolerance?.evenly),
          held_at_lowest_worst_against_tolerance: toleranceJson(r.drawDownTolerance?.held),
        }
      : null,
    notes: r.notes,
  };
}

function toleranceJson(f: FractionAgainstTolerance | undefined) {
  return f
    ? {
        species: f.species,
        deviation: f.deviation,
        design: f.design,
        tolerance: f.tolerance,
        within: f.within,
      }
    : null;
}
