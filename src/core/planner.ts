/**
 * The fill plan: cumulative target readings after each fill from the
 * density-form virial equation of the cumulative composition, beside the ideal-gas
 * plan, with a gauge and a tolerance band for each reading.
 *
 * Forward model (manometric method, rigid tank of volume V at temperature T):
 *   rho_f from P_f = rho R T (1 + B_mix rho + C_mix rho^2);  N = rho_f V;
 *   after fill k: n_k = cumulative amount, y^(k) its composition,
 *   P_k = (n_k/V) R T [1 + B_mix(y^(k)) n_k/V + C_mix(y^(k)) (n_k/V)^2].
 */
import { R } from './constants.js';
import type { Design, Fractions } from './composition.js';
import { allocate, type GasSource } from './supply.js';
import {
  bMix,
  cMix,
  compressibility,
  densityFromPressure,
  pressureFromDensity,
  virialModel,
  virialU,
  type VirialModel,
} from './mixture-eos.js';
import {
  chooseGauge,
  gaugeReadingPa,
  gaugeTopAbsolutePa,
  type Gauge,
  type ReadingContext,
} from './gauges.js';
import { getSpecies } from './lookup.js';
import { molarMassKgPerMol } from './formula.js';
import type { Finding } from './findings.js';
import { reviewFillSequence, type FillEvent, type SafetyContext, type TankState } from './safety.js';
import { adviseOrder, isSaferThan, scoreGivenOrder } from './order.js';
import { reviewFillPath } from './fill-path.js';
import { fail } from './problems.js';

/** temperatures the virial model is used at (reference table 230-480 K, correlation beyond) */
export const MODEL_T_RANGE_K = { min: 200, max: 600 } as const;
/** beyond this departure from ideal gas the truncated virial series is not trusted */
export const MAX_NON_IDEALITY = 0.05;

export interface Tolerance {
  /** allowed relative deviation of each mole fraction (0.005 = 0.5 %) */
  readonly relative: number;
  /** floor on the allowed absolute deviation of a mole fraction */
  readonly absolute: number;
}

export interface TankSpec {
  readonly id: string;
  readonly label: string;
  readonly volumeM3: number;
  /** maximum allowed working pressure, Pa absolute */
  readonly ratedPressurePa?: number;
  /** fraction of the rating used as the working limit (default 1) */
  readonly workingFraction?: number;
}

export interface PlanInput {
  readonly design: Design;
  readonly finalPressurePa: number;
  readonly temperatureK: number;
  readonly tank: TankSpec;
  /** the fills: in fill order when `order` is 'given', in any order when 'recommend' */
  readonly sources: readonly GasSource[];
  readonly order: 'given' | 'recommend';
  /** safety-review settings beyond the tank and temperature */
  readonly safety?: { readonly coldestK?: number; readonly condensationFraction?: number };
  readonly inTank?: { readonly composition: Fractions; readonly pressurePa: number };
  readonly gauges: readonly Gauge[];
  readonly reading: ReadingContext;
  readonly tolerance: Tolerance;
}

export interface GaugeAssignment {
  readonly id: string;
  readonly label: string;
  readonly unit: string;
  readonly reference: Gauge['reference'];
  /** what the gauge should show, Pa (gauge-referenced: above ambient) */
  readonly readingPa: number;
  readonly uncertaintyPa: number;
  /** display resolution, Pa: the sheet shows targets to this step */
  readonly resolutionPa: number;
}

export interface PlanStep {
  readonly kind: 'fill';
  /** 1-based */
  readonly index: number;
  readonly source: GasSource;
  readonly species: string;
  /** absolute tank pressure after this fill, Pa */
  readonly targetPa: number;
  readonly incrementPa: number;
  readonly amountMol: number;
  readonly massKg: number;
  /** what an ideal-gas spreadsheet would give: P_f times the cumulative amount fraction */
  readonly idealTargetPa: number;
  readonly compositionAfter: Record<string, number>;
  readonly compressibilityAfter: number;
  /** half-width of the tolerance band on the absolute reading, Pa */
  readonly bandPa: number;
  readonly gauge?: GaugeAssignment;
  /** gauges to close off before this fill, so they are not over-ranged */
  readonly isolateBefore: readonly { id: string; label: string; topPa: number }[];
}

export interface Plan {
  readonly design: Design;
  readonly temperatureK: number;
  readonly tank: TankSpec;
  readonly orderReason: string;
  readonly orderRecommended: boolean;
  /** composition the tank will hold, with cylinder impurities */
  readonly composition: Record<string, number>;
  readonly unidentifiedFraction: number;
  readonly initial?: {
    readonly pressurePa: number;
    readonly amountMol: number;
    readonly composition: Fractions;
  };
  readonly final: {
    readonly pressurePa: number;
    readonly temperatureK: number;
    readonly compressibility: number;
    readonly amountMol: number;
    readonly idealAmountMol: number;
    readonly densityMolPerM3: number;
    readonly bMixM3PerMol: number;
    readonly cMixM6PerMol2: number;
  };
  readonly steps: readonly PlanStep[];
  readonly virial: VirialModel;
  readonly findings: readonly Finding[];
  readonly tolerance: Tolerance;
}

/** how a fill is named: its gas, or for a premix its major gases ("N2+O2") */
export function fillLabel(s: GasSource): string {
  if (s.kind !== 'premix') return s.mainSpecies;
  return Object.entries(s.composition)
    .filter(([, v]) => v >= 0.01)
    .sort((a, b) => b[1] - a[1])
    .map(([k]) => k)
    .join('+');
}

function eosComposition(
  parts: readonly { source: GasSource | Fractions; mol: number }[],
): Record<string, number> {
  // for the equation of state a source's unidentified remainder is counted as its main gas
  const y: Record<string, number> = {};
  let total = 0;
  for (const { source, mol } of parts) {
    const isSource = 'composition' in source && 'mainSpecies' in source;
    const comp = isSource ? (source as GasSource).composition : (source as Fractions);
    for (const [k, v] of Object.entries(comp)) {
      y[k] = (y[k] ?? 0) + v * mol;
      total += v * mol;
    }
    if (isSource) {
      const s = source as GasSource;
      y[s.mainSpecies] = (y[s.mainSpecies] ?? 0) + s.unidentified * mol;
      total += s.unidentified * mol;
    }
  }
  for (const k of Object.keys(y)) y[k] /= total;
  return y;
}

function stateOf(model: VirialModel, y: Fractions, mol: number, volumeM3: number, temperatureK: number) {
  const rho = mol / volumeM3;
  const B = bMix(model, y);
  const C = cMix(model, y);
  return { rho, B, C, P: pressureFromDensity(rho, temperatureK, B, C), Z: compressibility(rho, B, C) };
}

/** dP/drho at fixed composition, Pa m3/mol */
function dPdRho(rho: number, temperatureK: number, B: number, C: number): number {
  return R * temperatureK * (1 + 2 * B * rho + 3 * C * rho * rho);
}

export function planFill(input: PlanInput): Plan {
  const { design, finalPressurePa: Pf, temperatureK: T, tank } = input;
  if (!(Pf > 0)) fail({ code: 'not-positive', what: 'final pressure', value: Pf }, { field: 'pressure' });
  if (!(T > 0)) fail({ code: 'not-positive', what: 'temperature', value: T }, { field: 'temperature' });
  if (!(tank.volumeM3 > 0))
    fail({ code: 'not-positive', what: 'tank volume', value: tank.volumeM3 }, { field: 'volume' });
  if (input.sources.length === 0) fail({ code: 'design-missing', reason: 'the plan has no fills' });
  if (T < MODEL_T_RANGE_K.min || T > MODEL_T_RANGE_K.max) {
    fail(
      {
        code: 'model-range',
        reason:
          `a fill at ${T.toFixed(2)} K is outside the range the gas model is built ` +
          `for (${MODEL_T_RANGE_K.min}-${MODEL_T_RANGE_K.max} K); check the temperature ` +
          `and its unit`,
      },
      { field: 'temperature' },
    );
  }
  const V = tank.volumeM3;

  const speciesSet = new Set<string>();
  for (const s of input.sources)
    for (const k of Object.keys(s.composition)) speciesSet.add(getSpecies(k).key);
  for (const k of Object.keys(input.inTank?.composition ?? {})) speciesSet.add(getSpecies(k).key);
  const model = virialModel([...speciesSet], T);

  // gas already in the tank
  let initial: Plan['initial'];
  if (input.inTank) {
    const y0 = input.inTank.composition;
    const rho0 = densityFromPressure(input.inTank.pressurePa, T, bMix(model, y0), cMix(model, y0));
    initial = { pressurePa: input.inTank.pressurePa, amountMol: rho0 * V, composition: y0 };
    if (input.inTank.pressurePa >= Pf) {
      fail(
        {
          code: 'design-conflict',
          reason:
            'the tank already holds gas at or above the final pressure; evacuate it or raise the final pressure',
        },
        { field: 'in_tank.pressure' },
      );
    }
  }

  // total amount: iterate allocation and density until the final reading is P_f
  let N = (Pf * V) / (R * T);
  let alloc = allocate(
    input.sources,
    design.composition,
    N,
    initial ? { composition: initial.composition, amountMol: initial.amountMol } : undefined,
  );
  let yFinal: Record<string, number> = {};
  let rhoF = 0;
  for (let it = 0; it < 30; it++) {
    alloc = allocate(
      input.sources,
      design.composition,
      N,
      initial ? { composition: initial.composition, amountMol: initial.amountMol } : undefined,
    );
    const parts = input.sources.map((s, i) => ({
      source: s as GasSource | Fractions,
      mol: alloc.amountsMol[i],
    }));
    if (initial) parts.push({ source: initial.composition, mol: initial.amountMol });
    yFinal = eosComposition(parts);
    rhoF = densityFromPressure(Pf, T, bMix(model, yFinal), cMix(model, yFinal));
    const have = alloc.amountsMol.reduce((a, b) => a + b, 0) + (initial?.amountMol ?? 0);
    const want = rhoF * V;
    const next = N * (want / have);
    if (Math.abs(next - N) <= 1e-13 * N) break;
    N = next;
  }
  const totalMol = rhoF * V;
  const zF = compressibility(rhoF, bMix(model, yFinal), cMix(model, yFinal));
  if (Math.abs(1 - zF) > MAX_NON_IDEALITY) {
    fail(
      {
        code: 'model-range',
        reason:
          `the finished batch would have Z = ${zF.toFixed(4)}; the truncated virial ` +
          `model is trusted only within ${MAX_NON_IDEALITY * 100} % of ideal gas. Lower ` +
          `the final pressure or plan this mixture with a full equation of state`,
      },
      { field: 'pressure' },
    );
  }
  const Bf = bMix(model, yFinal);
  const Cf = cMix(model, yFinal);

  const findings: Finding[] = [];
  const workingLimitPa =
    tank.ratedPressurePa === undefined ? undefined : tank.ratedPressurePa * (tank.workingFraction ?? 1);
  const safetyCtx: SafetyContext = {
    temperatureK: T,
    workingLimitPa,
    tankId: tank.id,
    coldestK: input.safety?.coldestK,
    condensationFraction: input.safety?.condensationFraction,
  };
  const initialForOrder = initial
    ? { composition: initial.composition, amountMol: initial.amountMol }
    : undefined;
  let sources: readonly GasSource[];
  let orderReason: string;
  if (input.order === 'recommend') {
    const advice = adviseOrder(input.sources, alloc.amountsMol, Pf, safetyCtx, initialForOrder);
    sources = advice.sources;
    orderReason = advice.reason;
    if (advice.noSafeOrder)
      findings.push({ severity: 'warning', code: 'no-safe-order', reason: advice.reason });
  } else {
    sources = input.sources;
    orderReason = 'as given';
    const given = scoreGivenOrder(input.sources, alloc.amountsMol, Pf, safetyCtx, initialForOrder);
    if (given.danger + given.warning > 0) {
      const advice = adviseOrder(input.sources, alloc.amountsMol, Pf, safetyCtx, initialForOrder);
      if (isSaferThan(advice.score, given))
        findings.push({
          severity: 'warning',
          code: 'safer-order',
          order: advice.sources.map(fillLabel),
          reason: advice.reason,
        });
    }
  }
  const amountOf = new Map(input.sources.map((s, i) => [s, alloc.amountsMol[i]]));
  const tol = input.tolerance;
  const tolOf = (k: string) => Math.max(tol.relative * (design.composition[k] ?? 0), tol.absolute);

  // cumulative states
  const parts: { source: GasSource | Fractions; mol: number }[] = initial
    ? [{ source: initial.composition, mol: initial.amountMol }]
    : [];
  let cumMol = initial?.amountMol ?? 0;
  let prevP = initial?.pressurePa ?? 0;
  const raw = sources.map((s) => {
    const mol = amountOf.get(s) ?? 0;
    parts.push({ source: s, mol });
    cumMol += mol;
    const y = eosComposition(parts);
    const st = stateOf(model, y, cumMol, V, T);
    const out = { source: s, mol, y, st, cumMol, inc: st.P - prevP };
    prevP = st.P;
    return out;
  });

  const sourceVec = (s: GasSource, k: string) =>
    (s.composition[k] ?? 0) + (s.mainSpecies === k ? s.unidentified : 0);
  const allSpecies = [...speciesSet];
  const connected = new Set(input.gauges.map((g) => g.id));
  const steps: PlanStep[] = raw.map((r, k) => {
    // tolerance band: an error dn in this fill, made good by the next fill's printed cumulative
    // target, moves x_i by (w_k,i - w_k+1,i) dn / N; on the last fill by (w_K,i - x_i) dn / N
    const next = raw[k + 1];
    let dnMax = Infinity;
    for (const sp of allSpecies) {
      const allowed = tolOf(sp);
      const sens = next
        ? Math.abs(sourceVec(r.source, sp) - sourceVec(next.source, sp))
        : Math.abs(sourceVec(r.source, sp) - (yFinal[sp] ?? 0));
      if (sens > 1e-15 && (design.composition[sp] ?? 0) > 0)
        dnMax = Math.min(dnMax, (allowed * totalMol) / sens);
    }
    if (!Number.isFinite(dnMax)) dnMax = tol.relative * r.mol;
    const bandPa = (dnMax / V) * dPdRho(r.st.rho, T, r.st.B, r.st.C);

    const isolateBefore: PlanStep['isolateBefore'][number][] = [];
    for (const g of input.gauges) {
      const top = gaugeTopAbsolutePa(g, input.reading);
      if (connected.has(g.id) && top < r.st.P + bandPa) {
        connected.delete(g.id);
        isolateBefore.push({ id: g.id, label: g.label, topPa: top });
      }
    }
    const choice = chooseGauge(
      input.gauges.filter((g) => connected.has(g.id)),
      r.st.P,
      r.st.P + bandPa,
      input.reading,
    );
    const stepNo = k + 1;
    if (!choice)
      findings.push({ severity: 'danger', code: 'no-gauge-covers', step: stepNo, pressurePa: r.st.P });
    else if (choice.uncertaintyPa * 3 > bandPa) {
      findings.push({
        severity: 'warning',
        code: 'gauge-coarser-than-band',
        step: stepNo,
        gauge: choice.gauge.id,
        uncertaintyPa: choice.uncertaintyPa,
        bandPa,
      });
    }
    let massKg = 0;
    for (const [sp, w] of Object.entries(r.source.composition))
      massKg += w * r.mol * molarMassKgPerMol(getSpecies(sp).elements);
    massKg += r.source.unidentified * r.mol * molarMassKgPerMol(getSpecies(r.source.mainSpecies).elements);
    if (r.source.supplyPressurePa !== undefined && r.source.supplyPressurePa <= r.st.P) {
      findings.push({
        severity: 'danger',
        code: 'supply-pressure-low',
        step: stepNo,
        source: r.source.id,
        supplyPa: r.source.supplyPressurePa,
        targetPa: r.st.P,
      });
    }
    return {
      kind: 'fill' as const,
      index: stepNo,
      source: r.source,
      species: fillLabel(r.source),
      targetPa: r.st.P,
      incrementPa: r.inc,
      amountMol: r.mol,
      massKg,
      idealTargetPa: (Pf * r.cumMol) / totalMol,
      compositionAfter: r.y,
      compressibilityAfter: r.st.Z,
      bandPa,
      gauge: choice && {
        id: choice.gauge.id,
        label: choice.gauge.label,
        unit: choice.gauge.unit,
        reference: choice.gauge.reference,
        readingPa: gaugeReadingPa(choice.gauge, r.st.P, input.reading),
        uncertaintyPa: choice.uncertaintyPa,
        resolutionPa: choice.gauge.resolutionPa,
      },
      isolateBefore,
    };
  });

  // batch-level findings
  if (tank.ratedPressurePa !== undefined && workingLimitPa !== undefined) {
    const top = steps[steps.length - 1];
    if (top.targetPa + top.bandPa > workingLimitPa) {
      findings.push({
        severity: 'danger',
        code: 'tank-over-rating',
        step: top.index,
        pressurePa: top.targetPa + top.bandPa,
        limitPa: workingLimitPa,
        ratedPa: tank.ratedPressurePa,
        tank: tank.id,
      });
    }
  }
  for (const s of steps)
    for (const g of s.isolateBefore)
      findings.push({ severity: 'note', code: 'isolate-gauge', step: s.index, gauge: g.id, topPa: g.topPa });
  // the safety review of every state the fill passes through, at the real-gas pressures
  const states: TankState[] = [];
  const fills: FillEvent[] = [];
  let before: TankState | undefined = initial
    ? { step: 0, composition: initial.composition, pressurePa: initial.pressurePa, final: false }
    : undefined;
  if (before) states.push(before);
  for (const s of steps) {
    const after: TankState = {
      step: s.index,
      composition: s.compositionAfter,
      pressurePa: s.targetPa,
      final: s.index === steps.length,
    };
    states.push(after);
    fills.push({
      step: s.index,
      sourceId: s.source.id,
      sourceComposition: s.source.composition,
      before,
      after,
    });
    before = after;
  }
  findings.push(...reviewFillSequence(states, fills, safetyCtx));
  // and the path of each fill between those states, in the tank and at its inlet
  for (const f of fills) findings.push(...reviewFillPath(f, safetyCtx));
  // the advice ranks orders at ideal-gas pressures; where the full review of the planned fill
  // still finds a path or line hazard, the stated reason must not say the order is free of them
  const left = findings.filter(
    (f) =>
      f.severity !== 'note' &&
      (f.code === 'flammable-fill-path' ||
        f.code === 'flammable-at-inlet' ||
        (f.code === 'condensation' && f.inLine)),
  );
  if (input.order === 'recommend' && left.length && /free of the hazards checked/.test(orderReason)) {
    orderReason =
      `the least hazardous order found, but the full review of the planned fill ` +
      `still finds ${[...new Set(left.map((f) => f.code))].join(', ')} (see the findings)`;
  }
  for (const s of sources)
    if (s.purityAssumed)
      findings.push({ severity: 'note', code: 'purity-assumed', source: s.id, species: s.mainSpecies });
  if (alloc.unidentified > 1e-7)
    findings.push({ severity: 'note', code: 'unidentified-impurity', fraction: alloc.unidentified });
  for (const [sp, x] of Object.entries(alloc.composition)) {
    const xd = design.composition[sp] ?? 0;
    if (xd === 0 && x > 1e-7)
      findings.push({ severity: 'note', code: 'impurity-present', species: sp, fraction: x });
    else if (xd > 0 && Math.abs(x - xd) > tolOf(sp))
      findings.push({ severity: 'warning', code: 'supply-mismatch', species: sp, design: xd, actual: x });
  }
  for (const e of model.entries) {
    if (e.i === e.j && e.method !== 'reference')
      findings.push({
        severity: 'note',
        code: 'virial-correlation',
        species: e.i,
        method:
          e.method === 'tsonopoulos-quantum'
            ? 'Tsonopoulos (effective quantum-gas constants)'
            : 'Tsonopoulos',
      });
  }
  // how far the combining-rule cross coefficients could move the targets: rho dB at the fill where it is
  // largest, dB = sqrt(sum (2 y_i y_j u_ij)^2) over the pairs of species at 1e-4 or more
  const crossShift = crossVirialShift(model, steps, T);
  // a warning when it reaches a third of the band (the rule of gauge-coarser-than-band), else a note
  if (crossShift && crossShift.relative > CROSS_NOTE_RELATIVE) {
    findings.push({
      severity: crossShift.shiftPa * 3 >= crossShift.bandPa ? 'warning' : 'note',
      code: 'cross-virial-estimate',
      ...crossShift,
    });
  }
  let worst = 0;
  let worstBand = Infinity;
  for (const s of steps) {
    const d = Math.abs(s.targetPa - s.idealTargetPa);
    if (d > worst) {
      worst = d;
      worstBand = s.bandPa;
    }
  }
  if (worst > worstBand)
    findings.push({ severity: 'warning', code: 'ideal-gas-error', worstPa: worst, bandPa: worstBand });

  return {
    design,
    temperatureK: T,
    tank,
    orderReason,
    orderRecommended: input.order === 'recommend',
    composition: alloc.composition,
    unidentifiedFraction: alloc.unidentified,
    initial,
    final: {
      pressurePa: Pf,
      temperatureK: T,
      compressibility: compressibility(rhoF, Bf, Cf),
      amountMol: totalMol,
      idealAmountMol: (Pf * V) / (R * T),
      densityMolPerM3: rhoF,
      bMixM3PerMol: Bf,
      cMixM6PerMol2: Cf,
    },
    steps,
    virial: model,
    findings,
    tolerance: tol,
  };
}

/** a note is due when the combining-rule cross coefficients could move a target by more than this (relative) */
const CROSS_NOTE_RELATIVE = 1e-4;

function crossVirialShift(
  model: VirialModel,
  steps: readonly PlanStep[],
  temperatureK: number,
): { step: number; pairs: string[]; relative: number; shiftPa: number; bandPa: number } | undefined {
  let best: { step: number; pairs: string[]; relative: number; shiftPa: number; bandPa: number } | undefined;
  for (const s of steps) {
    const y = s.compositionAfter;
    const rho = s.targetPa / (s.compressibilityAfter * R * temperatureK);
    let v = 0;
    const pairs: string[] = [];
    for (const e of model.entries) {
      if (e.i === e.j || e.method !== 'combining-rule') continue;
      const yi = y[e.i] ?? 0;
      const yj = y[e.j] ?? 0;
      if (yi < 1e-4 || yj < 1e-4) continue;
      v += (2 * yi * yj * virialU(e)) ** 2;
      pairs.push(`${e.i}-${e.j}`);
    }
    const relative = rho * Math.sqrt(v);
    if (pairs.length && (!best || relative > best.relative))
      best = { step: s.index, pairs, relative, shiftPa: relative * s.targetPa, bandPa: s.bandPa };
  }
  return best;
}
