/** mixwright ready: mixing time and contamination of a filled tank, as text and JSON. */
import type { Contamination, MixingEstimate } from '../core/index.js';
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
  if (c.aboveAmbient)
    out.push(
      '  the tank is above ambient pressure: air does not leak in (gas leaks out; ' +
        'the composition keeps, the pressure falls)',
    );
  else {
    out.push(
      `  air leaking in at ${fixedSig((r.leakRatePaPerS * 60) / TORR_PA, 3)} ` +
        `Torr/min (under vacuum), scaled by the pressure difference: ${fixedSig(c.ingressPerDay * 1e6, 3)} ` +
        `ppm of the batch per day, ${fixedSig(c.o2PerDay * 1e6, 3)} ppm O2 per day`,
    );
  }
  if (c.phiStart !== undefined && c.phiAfter !== undefined) {
    const drift =
      c.phiDriftPerDay !== undefined ? ` (${(c.phiDriftPerDay * 100).toPrecision(2)} % per day)` : '';
    out.push(
      `  phi ${c.phiStart.toFixed(5)} at the start, ${c.phiAfter.toFixed(5)} after ` +
        `${r.days} days${drift}`,
    );
  }
  for (const n of r.notes) out.push(`note: ${n}`);
  return out.join('\n') + '\n';
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
    },
    notes: r.notes,
  };
}
