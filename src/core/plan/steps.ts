/**
 * Stage 4 of the fill plan: one step per charge, with its cumulative real-gas target,
 * tolerance band, gauge (and the gauges to isolate before it), amount and mass.
 *
 * Forward model (manometric method, rigid tank of volume V at temperature T): after
 * charge k the tank holds n_k mol of composition y^(k), and reads
 *   P_k = (n_k/V) R T [1 + B_mix(y^(k)) n_k/V + C_mix(y^(k)) (n_k/V)^2].
 */
import { R } from '../constants.js';
import { fillLabel, type GasSource } from '../supply.js';
import type { Fractions } from '../composition.js';
import { bMix, cMix, compressibility, pressureFromDensity } from '../mixture-eos.js';
import { chooseGauge, gaugeReadingPa, gaugeTopAbsolutePa, type Gauge } from '../gauges.js';
import { getSpecies } from '../lookup.js';
import { molarMassKgPerMol } from '../formula.js';
import type { Finding } from '../findings.js';
import type { PlanBasis } from './validate.js';
import { eosComposition, type PlanAmounts } from './amounts.js';
import type { PlanSequence } from './sequence.js';
import { chargeAmounts, chargeNumbers, type Charge } from './charges.js';
import { supplyFindings } from '../supply-check.js';
import { allowedDeviation, type PlanStep } from './types.js';

/** what the step stage hands on */
export interface PlanSteps {
  readonly steps: readonly PlanStep[];
  /** no-gauge-covers and the supply's findings (supply-check.ts), in step order */
  readonly findings: readonly Finding[];
}

/** the tank after one charge */
interface ChargeState {
  readonly source: GasSource;
  readonly mol: number;
  readonly cumMol: number;
  readonly y: Record<string, number>;
  readonly rho: number;
  readonly B: number;
  readonly C: number;
  readonly P: number;
  readonly Z: number;
  readonly incrementPa: number;
}

/** the steps of the plan and the findings of each */
export function planSteps(basis: PlanBasis, amounts: PlanAmounts, sequence: PlanSequence): PlanSteps {
  const mols = chargeAmounts(basis, sequence.charges, basis.input.sources, amounts.allocation.amountsMol);
  const states = chargeStates(basis, sequence.charges, mols);
  const numbers = chargeNumbers(sequence.charges.map((c) => c.source.id));
  const connected = new Set(manifoldOf(basis).map((g) => g.id));
  const findings: Finding[] = [];
  // the supply of each source judged as the final checks judge it (supply-check.ts)
  const supplied = supplyFindings(
    states.map((st, k) => ({ step: k + 1, source: st.source, targetPa: st.P, amountMol: st.mol })),
    basis.temperatureK,
  );
  const steps = states.map((st, k): PlanStep => {
    const stepNo = k + 1;
    const bandPa = toleranceBandPa(basis, amounts, st, states[k + 1]);
    const isolateBefore = isolateFor(basis, connected, st.P + bandPa);
    const choice = chooseGauge(
      basis.input.gauges.filter((g) => connected.has(g.id)),
      st.P,
      st.P + bandPa,
      basis.input.reading,
    );
    // how well the readings are known is the predicted uncertainty's (predict.ts), not a per-reading rule
    if (!choice)
      findings.push({ severity: 'danger', code: 'no-gauge-covers', step: stepNo, pressurePa: st.P });
    findings.push(...supplied.filter((f) => f.step === stepNo));
    return {
      kind: 'fill' as const,
      index: stepNo,
      source: st.source,
      species: fillLabel(st.source),
      charge: numbers[k],
      targetPa: st.P,
      incrementPa: st.incrementPa,
      amountMol: st.mol,
      massKg: massKg(st.source, st.mol),
      idealTargetPa: (basis.finalPressurePa * st.cumMol) / amounts.totalMol,
      compositionAfter: st.y,
      compressibilityAfter: st.Z,
      bandPa,
      gauge: choice && assignment(choice.gauge, choice.uncertaintyPa, st.P, basis),
      isolateBefore,
    };
  });
  return { steps, findings };
}

/** the cumulative state of the tank after each charge */
function chargeStates(basis: PlanBasis, charges: readonly Charge[], mols: readonly number[]): ChargeState[] {
  const { initial, model, volumeM3: V, temperatureK: T } = basis;
  const parts: { source: GasSource | Fractions; mol: number }[] = initial
    ? [{ source: initial.composition, mol: initial.amountMol }]
    : [];
  let cumMol = initial?.amountMol ?? 0;
  let prevP = initial?.pressurePa ?? 0;
  return charges.map(({ source }, k) => {
    const mol = mols[k];
    parts.push({ source, mol });
    cumMol += mol;
    const y = eosComposition(parts);
    const rho = cumMol / V;
    const B = bMix(model, y);
    const C = cMix(model, y);
    const P = pressureFromDensity(rho, T, B, C);
    const out = {
      source,
      mol,
      cumMol,
      y,
      rho,
      B,
      C,
      P,
      Z: compressibility(rho, B, C),
      incrementPa: P - prevP,
    };
    prevP = P;
    return out;
  });
}

/** a source's mole fraction of species k, its unidentified remainder counted as its main gas */
function sourceFraction(s: GasSource, k: string): number {
  return (s.composition[k] ?? 0) + (s.mainSpecies === k ? s.unidentified : 0);
}

/**
 * Half-width of the tolerance band on a charge's absolute reading, Pa. An error dn in this
 * charge, made good by the next charge's printed cumulative target, moves x_i by
 * (w_k,i - w_k+1,i) dn / N; on the last charge by (w_K,i - x_i) dn / N. The band is the dn
 * that keeps every design fraction within its tolerance, times dP/dn at fixed composition.
 * With split charges the same holds: every later charge, a later charge of this same source
 * included, fills to its own printed cumulative target, so it delivers its planned amount and
 * only the next charge absorbs dn (two charges of one source are never next to each other,
 * charges.ts refuses that). A stop reading is such a printed target too.
 */
function toleranceBandPa(
  basis: PlanBasis,
  amounts: PlanAmounts,
  st: ChargeState,
  next: ChargeState | undefined,
): number {
  const { design, tolerance: tol } = basis.input;
  let dnMax = Infinity;
  for (const sp of basis.species) {
    const allowed = allowedDeviation(tol, design.composition[sp] ?? 0);
    const sens = next
      ? Math.abs(sourceFraction(st.source, sp) - sourceFraction(next.source, sp))
      : Math.abs(sourceFraction(st.source, sp) - (amounts.composition[sp] ?? 0));
    if (sens > 1e-15 && (design.composition[sp] ?? 0) > 0)
      dnMax = Math.min(dnMax, (allowed * amounts.totalMol) / sens);
  }
  if (!Number.isFinite(dnMax)) dnMax = tol.relative * st.mol;
  return (dnMax / basis.volumeM3) * dPdRho(st.rho, basis.temperatureK, st.B, st.C);
}

/** dP/drho at fixed composition, Pa m3/mol */
function dPdRho(rho: number, temperatureK: number, B: number, C: number): number {
  return R * temperatureK * (1 + 2 * B * rho + 3 * C * rho * rho);
}

/** every head on the manifold: the plan's reading gauges, and any others it must close off */
function manifoldOf(basis: PlanBasis): readonly Gauge[] {
  const read = basis.input.gauges;
  const others = (basis.input.manifoldGauges ?? []).filter((g) => !read.some((r) => r.id === g.id));
  return [...read, ...others];
}

/** the still-connected gauges whose range ends below `upperPa`: they are closed off (and forgotten) */
function isolateFor(basis: PlanBasis, connected: Set<string>, upperPa: number): PlanStep['isolateBefore'] {
  const out: PlanStep['isolateBefore'][number][] = [];
  for (const g of manifoldOf(basis)) {
    const top = gaugeTopAbsolutePa(g, basis.input.reading);
    if (connected.has(g.id) && top < upperPa) {
      connected.delete(g.id);
      out.push({ id: g.id, label: g.label, topPa: top });
    }
  }
  return out;
}

function assignment(g: Gauge, uncertaintyPa: number, absolutePa: number, basis: PlanBasis) {
  return {
    id: g.id,
    label: g.label,
    unit: g.unit,
    reference: g.reference,
    readingPa: gaugeReadingPa(g, absolutePa, basis.input.reading),
    uncertaintyPa,
    resolutionPa: g.resolutionPa,
  };
}

/** mass a charge delivers, kg (its unidentified remainder weighed as its main gas) */
function massKg(source: GasSource, mol: number): number {
  let m = 0;
  for (const [sp, w] of Object.entries(source.composition))
    m += w * mol * molarMassKgPerMol(getSpecies(sp).elements);
  m += source.unidentified * mol * molarMassKgPerMol(getSpecies(source.mainSpecies).elements);
  return m;
}
