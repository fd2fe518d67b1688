/**
 * The uncertainty budget of a re-checked batch.
 *
 * Inputs are built as independent components, so that correlations come from the
 * model itself: one span factor and one zero offset per gauge (shared by all its
 * readings: a span error largely cancels in ratios of readings on the same gauge),
 * one resolution term per reading, the barometer (shared by gauge-referenced
 * readings), one thermometer offset (shared) and one resolution term per reading,
 * one term per virial coefficient, and one purity term per source.
 *  - GUM (JCGM 100:2008) law of propagation: u_c^2 = sum (c_i u_i)^2 over the
 *    independent inputs, c_i u_i by central differences of the inverse model.
 *  - Monte Carlo (JCGM 101:2008): M trials of the same model with each input drawn
 *    from its distribution (rectangular for gauge specifications, resolution and
 *    purity; normal for the barometer, the thermometer and virial coefficients),
 *    a seeded xoshiro128** generator, the probabilistically symmetric 95 % interval,
 *    and the validation of the GUM interval of JCGM 101 section 8.
 */
import { gaugeReadingPa, type Gauge } from './gauges.js';
import type { CompositionTerm, GasSource } from './supply.js';
import { inverseSetup, invertReadings, workspaceFor, type InverseSetup } from './recheck.js';
import { virialU } from './mixture-eos.js';
import { speciesRole, type Fractions } from './composition.js';
import { oxygenDemand } from './formula.js';
import { getSpecies } from './lookup.js';
import { xoshiro128ss } from './prng.js';

export interface CheckedReading {
  readonly step: number;
  readonly source: GasSource;
  /** which charge of its source this reading ends, of how many (a source filled in more than one charge) */
  readonly charge?: { readonly number: number; readonly of: number };
  /** absolute pressure after the fill, Pa */
  readonly pressurePa: number;
  readonly temperatureK: number;
  readonly gauge: Gauge;
}

export interface UncertaintySettings {
  readonly barometricPa: number;
  readonly barometricUncertaintyPa: number;
  /** standard uncertainty of the tank thermometer (an offset common to all readings), K */
  readonly thermometerUncertaintyK: number;
  /** thermometer display resolution, K */
  readonly thermometerResolutionK: number;
  /**
   * half-width of a rectangular difference between the gas temperature and the thermometer at
   * each reading after the settling time (the heat of the fill not yet gone), K; independent
   * from reading to reading. Undefined or 0: not counted (the re-check of a log made before it)
   */
  readonly temperatureSettlingK?: number;
  /** Monte Carlo trials (>= 1e5 for a reported result) and seed */
  readonly trials: number;
  readonly seed: number;
}

type Dist = 'rectangular' | 'normal';

export interface InputComponent {
  readonly name: string;
  readonly dist: Dist;
  /** rectangular: half-width; normal: standard deviation */
  readonly scale: number;
  /** standard uncertainty */
  readonly u: number;
  readonly unit: string;
  /** what the component is: which gauge, reading (step), source or coefficient it belongs to */
  readonly about: ComponentAbout;
}

export type ComponentAbout =
  | { readonly kind: 'span' | 'zero'; readonly gauge: string }
  | {
      readonly kind: 'resolution';
      readonly gauge: string;
      readonly step: number;
      readonly pressurePa: number;
    }
  | { readonly kind: 'barometer' | 'thermometer' }
  | { readonly kind: 'temperature-resolution' | 'temperature-settling'; readonly step: number }
  | { readonly kind: 'virial'; readonly pair: readonly [string, string] }
  | { readonly kind: 'purity'; readonly source: string }
  /** an input of a source's own composition uncertainty (a premix's first-stage budget) */
  | { readonly kind: 'source-composition'; readonly source: string; readonly input: string };

export interface OutputStat {
  readonly value: number;
  readonly u: number;
  /** GUM 95 % interval, k = 2 */
  readonly low: number;
  readonly high: number;
  readonly mc?: {
    readonly mean: number;
    readonly u: number;
    readonly low: number;
    readonly high: number;
    readonly validated: boolean;
    readonly tolerance: number;
  };
  /** the largest contributions c_i u_i, largest first */
  readonly budget: readonly { readonly name: string; readonly contribution: number }[];
  /** every contribution c_i u_i (signed), in the order of the result's components */
  readonly contributions?: readonly number[];
}

export interface UncertaintyResult {
  readonly species: readonly string[];
  readonly composition: Record<string, OutputStat>;
  readonly phi?: OutputStat;
  readonly diluentFraction?: OutputStat;
  readonly unidentified: number;
  readonly components: readonly InputComponent[];
  readonly trials: number;
  readonly seed: number;
}

interface Model {
  readonly setup: InverseSetup;
  readonly components: InputComponent[];
  /** apply a vector of component values to get the outputs */
  readonly evaluate: (v: Float64Array) => Float64Array;
  readonly outputs: readonly string[];
}

/** gas already in the tank before the first fill (a top-up) */
export interface InTank {
  readonly composition: Fractions;
  readonly pressurePa: number;
  readonly temperatureK: number;
}

/** what the model is built from: the readings, the settings, the diluent group, a top-up's start */
export interface ModelInput {
  readonly readings: readonly CheckedReading[];
  readonly settings: UncertaintySettings;
  readonly diluent: readonly string[];
  readonly initial?: InTank;
}

type AddComponent = (name: string, dist: Dist, scale: number, unit: string, about: ComponentAbout) => number;

/** per reading, the index of each input component that moves it (-1: none) */
interface ReadingInputs {
  readonly span: Int32Array;
  readonly zero: Int32Array;
  readonly resolution: Int32Array;
  readonly barometer: Int32Array;
  readonly thermometer: number;
  readonly temperatureResolution: Int32Array;
  readonly settling: Int32Array;
  readonly purity: Int32Array;
  readonly virial: readonly { i: number; j: number; c: number }[];
  /** a source's composition terms: the component, the readings from that source, the change per unit (length S) */
  readonly composition: readonly {
    readonly c: number;
    readonly readings: number[];
    readonly dw: Float64Array;
  }[];
}

/** the independent input components (module comment) and which reading each one moves */
function buildComponents(
  readings: readonly CheckedReading[],
  settings: UncertaintySettings,
  setup: InverseSetup,
): { components: InputComponent[]; inputs: ReadingInputs } {
  const components: InputComponent[] = [];
  const add: AddComponent = (name, dist, scale, unit, about) => {
    const u = dist === 'rectangular' ? scale / Math.sqrt(3) : scale;
    components.push({ name, dist, scale, u, unit, about });
    return components.length - 1;
  };
  const perReading = (f: (r: CheckedReading) => number) => Int32Array.from(readings.map(f));
  const gauges = [...new Map(readings.map((r) => [r.gauge.id, r.gauge])).values()];
  const spanIdx = new Map<string, number>();
  const offIdx = new Map<string, number>();
  for (const g of gauges) {
    if (g.accuracyOfReading > 0)
      spanIdx.set(
        g.id,
        add(`span of ${g.id}`, 'rectangular', g.accuracyOfReading, '1', { kind: 'span', gauge: g.id }),
      );
    if (g.accuracyOfFullScale > 0)
      offIdx.set(
        g.id,
        add(`zero of ${g.id}`, 'rectangular', g.accuracyOfFullScale * g.fullScalePa, 'Pa', {
          kind: 'zero',
          gauge: g.id,
        }),
      );
  }
  const resolution = perReading((r) =>
    r.gauge.resolutionPa > 0
      ? add(`resolution, reading ${r.step}`, 'rectangular', r.gauge.resolutionPa / 2, 'Pa', {
          kind: 'resolution',
          gauge: r.gauge.id,
          step: r.step,
          pressurePa: r.pressurePa,
        })
      : -1,
  );
  const baroIdx = readings.some((r) => r.gauge.reference === 'gauge')
    ? add('barometer', 'normal', settings.barometricUncertaintyPa, 'Pa', { kind: 'barometer' })
    : -1;
  const thermometer =
    settings.thermometerUncertaintyK > 0
      ? add('thermometer', 'normal', settings.thermometerUncertaintyK, 'K', { kind: 'thermometer' })
      : -1;
  const tRes = settings.thermometerResolutionK;
  const temperatureResolution = perReading((r) =>
    tRes > 0
      ? add(`temperature resolution, reading ${r.step}`, 'rectangular', tRes / 2, 'K', {
          kind: 'temperature-resolution',
          step: r.step,
        })
      : -1,
  );
  const settle = settings.temperatureSettlingK ?? 0;
  const settling = perReading((r) =>
    settle > 0
      ? add(`temperature settling, reading ${r.step}`, 'rectangular', settle, 'K', {
          kind: 'temperature-settling',
          step: r.step,
        })
      : -1,
  );
  const virial = virialComponents(setup, add);
  // the unidentified remainder of a cylinder could be more or less of its main gas: +-half of it, rectangular;
  // one term per source, shared by its readings (a source filled in two charges is one cylinder's gas)
  const purityIdx = new Map<string, number>();
  const purity = perReading((r) => {
    if (!(r.source.unidentified > 0)) return -1;
    const known = purityIdx.get(r.source.id);
    if (known !== undefined) return known;
    const idx = add(`purity of ${r.source.id}`, 'rectangular', r.source.unidentified / 2, '1', {
      kind: 'purity',
      source: r.source.id,
    });
    purityIdx.set(r.source.id, idx);
    return idx;
  });
  const composition = compositionComponents(readings, setup, add, components);
  const inputs: ReadingInputs = {
    composition,
    span: perReading((r) => spanIdx.get(r.gauge.id) ?? -1),
    zero: perReading((r) => offIdx.get(r.gauge.id) ?? -1),
    resolution,
    barometer: perReading((r) => (r.gauge.reference === 'gauge' ? baroIdx : -1)),
    thermometer,
    temperatureResolution,
    settling,
    purity,
    virial,
  };
  return { components, inputs };
}

/**
 * One component per composition term of each source (GasSource.compositionTerms), shared by every
 * reading from that source: the same premix gas is drawn at each of its charges.
 */
function compositionComponents(
  readings: readonly CheckedReading[],
  setup: InverseSetup,
  add: AddComponent,
  built: readonly InputComponent[],
): ReadingInputs['composition'] {
  const out: { c: number; readings: number[]; dw: Float64Array }[] = [];
  const sources = [...new Map(readings.map((r) => [r.source.id, r.source])).values()];
  for (const src of sources) {
    const at = readings.flatMap((r, k) => (r.source.id === src.id ? [k] : []));
    for (const t of src.compositionTerms ?? []) {
      const dw = new Float64Array(setup.species.length);
      for (const [k, v] of Object.entries(t.sensitivity)) {
        const i = setup.species.indexOf(k);
        // a species the source does not hold cannot change: a term naming one is a caller's error
        if (i < 0) throw new Error(`composition term ${t.name} of ${src.id} names ${k}, not in the source`);
        dw[i] = v;
      }
      // an instrument that reads the batch too: its one input moves both stages (JCGM 100 5.2: a
      // common input is one variable, not two independent ones)
      const same = t.shared ? sharedComponent(built, t) : -1;
      if (same >= 0) {
        out.push({ c: same, readings: at, dw });
        continue;
      }
      const about: ComponentAbout = { kind: 'source-composition', source: src.id, input: t.name };
      out.push({ c: add(`${src.id}: ${t.name}`, t.dist, t.scale, t.unit, about), readings: at, dw });
    }
  }
  return out;
}

/**
 * The batch's own component for a source term's shared instrument (the same gauge's span or zero,
 * the thermometer's offset) when it has the same distribution and scale; -1 when there is none
 * (the instrument does not read the batch, or its specification differs: then it is another one)
 */
function sharedComponent(built: readonly InputComponent[], t: CompositionTerm): number {
  const s = t.shared!;
  return built.findIndex(
    (c) =>
      c.about.kind === s.kind &&
      (s.kind === 'thermometer' || ('gauge' in c.about && c.about.gauge === s.gauge)) &&
      c.dist === t.dist &&
      Math.abs(c.scale - t.scale) <= 1e-12 * Math.abs(t.scale),
  );
}

/** one normal component per second virial coefficient of the species at 1e-4 or more */
function virialComponents(setup: InverseSetup, add: AddComponent): { i: number; j: number; c: number }[] {
  const out: { i: number; j: number; c: number }[] = [];
  // virial terms of trace species (impurities below 1e-4 in every source) move no output measurably: left out
  const major = new Set(
    setup.species.filter((_, i) => setup.wId.some((w) => w[i] >= 1e-4) || (setup.initial?.y[i] ?? 0) >= 1e-4),
  );
  for (const e of setup.model.entries) {
    if (!major.has(e.i) || !major.has(e.j)) continue;
    const i = setup.species.indexOf(e.i);
    const j = setup.species.indexOf(e.j);
    out.push({
      i,
      j,
      c: add(`B ${e.i}-${e.j}`, 'normal', virialU(e), 'm3/mol', { kind: 'virial', pair: [e.i, e.j] }),
    });
  }
  return out;
}

function buildModel(input: ModelInput): Model {
  const { readings, settings, diluent, initial } = input;
  const setup = inverseSetup(
    readings.map((r) => ({ source: r.source, pressurePa: r.pressurePa, temperatureK: r.temperatureK })),
    initial,
  );
  const S = setup.species.length;
  const K = readings.length;
  const { components, inputs: ix } = buildComponents(readings, settings, setup);
  const ctx = {
    barometricPa: settings.barometricPa,
    barometricUncertaintyPa: settings.barometricUncertaintyPa,
  };
  const readingPa = readings.map((r) => gaugeReadingPa(r.gauge, r.pressurePa, ctx));
  const dilIdx = diluent.map((k) => setup.species.indexOf(k)).filter((i) => i >= 0);
  const outputs = [...setup.species, 'phi', 'diluent'];
  const P = new Float64Array(K);
  const T = new Float64Array(K);
  const bAbs = new Float64Array(S * S);
  const pur = new Float64Array(K);
  const dw = ix.composition.length ? new Float64Array(K * S) : undefined;
  const ws = workspaceFor(setup);
  const demand = setup.species.map((k) => oxygenDemand(getSpecies(k).elements));
  const out = new Float64Array(S + 2);
  const P0 = Float64Array.from(readings.map((r) => r.pressurePa));
  const T0 = Float64Array.from(readings.map((r) => r.temperatureK));
  const nominalRho = Float64Array.from(invertReadings(setup, undefined, [...P0]).rho);
  const at = (v: Float64Array, idx: number) => (idx >= 0 ? v[idx] : 0);
  const evaluate = (v: Float64Array): Float64Array => {
    for (let k = 0; k < K; k++) {
      P[k] =
        P0[k] +
        at(v, ix.span[k]) * readingPa[k] +
        at(v, ix.zero[k]) +
        at(v, ix.resolution[k]) +
        at(v, ix.barometer[k]);
      T[k] = T0[k] + at(v, ix.thermometer) + at(v, ix.temperatureResolution[k]) + at(v, ix.settling[k]);
      pur[k] = at(v, ix.purity[k]);
    }
    bAbs.fill(0);
    for (const b of ix.virial) {
      bAbs[b.i * S + b.j] = v[b.c];
      bAbs[b.j * S + b.i] = v[b.c];
    }
    if (dw) {
      dw.fill(0);
      for (const t of ix.composition) {
        const val = v[t.c];
        if (val !== 0) for (const k of t.readings) for (let i = 0; i < S; i++) dw[k * S + i] += val * t.dw[i];
      }
    }
    const perturbation = { pressurePa: P, temperatureK: T, bAbsolute: bAbs, purity: pur, composition: dw };
    const res = invertReadings(setup, perturbation, undefined, ws, nominalRho);
    out.set(res.x);
    // phi on the O-atom basis, as composition.equivalenceRatio, from precomputed O2 demands
    let need = 0;
    let supply = 0;
    for (let i = 0; i < S; i++) {
      if (demand[i] > 0) need += res.x[i] * demand[i];
      else supply -= res.x[i] * demand[i];
    }
    out[S] = need > 0 && supply > 0 ? need / supply : NaN;
    let d = 0;
    for (const i of dilIdx) d += res.x[i];
    out[S + 1] = d;
    return out;
  };
  return { setup, components, evaluate, outputs };
}

/**
 * The re-check model's nominal outputs at the readings as given (no input moved off its value): each
 * species' mole fraction, 'phi' and 'diluent' (the fraction of the species named in `diluent`)
 */
export function nominalOutputs(
  readings: readonly CheckedReading[],
  settings: UncertaintySettings,
  diluent: readonly string[],
  initial?: { composition: Fractions; pressurePa: number; temperatureK: number },
): Record<string, number> {
  const m = buildModel({ readings, settings, diluent, initial });
  const v = m.evaluate(new Float64Array(m.components.length));
  return Object.fromEntries(m.outputs.map((k, i) => [k, v[i]]));
}

/** k-th smallest value (0-based) by quickselect; reorders `a` */
function select(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[k];
}

/** the p-quantile with linear interpolation between order statistics; reorders `a` */
function percentile(a: Float64Array, p: number): number {
  const pos = p * (a.length - 1);
  const lo = Math.floor(pos);
  const vlo = select(a, lo);
  if (lo + 1 >= a.length || pos === lo) return vlo;
  // the next order statistic is the smallest value above position lo
  let vhi = Infinity;
  for (let i = lo + 1; i < a.length; i++) if (a[i] < vhi) vhi = a[i];
  return vlo + (vhi - vlo) * (pos - lo);
}

/** JCGM 101 7.9.2: numerical tolerance of u expressed to two significant digits */
export function numericalTolerance(u: number): number {
  if (!(u > 0)) return 0;
  const l = Math.floor(Math.log10(u)) - 1;
  return 0.5 * 10 ** l;
}

/** number of independent random streams the trials are split into (run one after another or in parallel) */
export const MC_STREAMS = 2;

/** seed of stream i for a run seeded with `seed` */
export function streamSeed(seed: number, i: number): number {
  return (Math.imul(seed >>> 0, 2654435761) + i * 0x9e3779b9) >>> 0;
}

/** the trial count of stream i: the trials split as evenly as possible */
export function streamTrials(trials: number, i: number): number {
  const base = Math.floor(trials / MC_STREAMS);
  return i < trials - base * MC_STREAMS ? base + 1 : base;
}

/** one stream of Monte Carlo trials: the model's input and the stream's size and seed */
export interface MonteCarloJob {
  readonly readings: readonly CheckedReading[];
  readonly settings: UncertaintySettings;
  /** the species counted in the diluent fraction; the inerts when not given */
  readonly diluent?: readonly string[];
  readonly initial?: InTank;
  readonly trials: number;
  readonly seed: number;
}

/**
 * The Monte Carlo draws of one stream: outputs (species fractions, phi, diluent) by trial.
 * Pure and self-contained, so a shell may run the streams in parallel.
 */
export function monteCarloSamples(job: MonteCarloJob): Float64Array[] {
  const diluent = job.diluent ?? defaultDiluent(job.readings);
  const m = buildModel({ readings: job.readings, settings: job.settings, diluent, initial: job.initial });
  return drawSamples(m, job.trials, job.seed);
}

function defaultDiluent(readings: readonly CheckedReading[]): string[] {
  return [...new Set(readings.flatMap((r) => Object.keys(r.source.composition)))].filter(
    (k) => speciesRole(k) === 'inert',
  );
}

function drawSamples(m: Model, trials: number, seed: number): Float64Array[] {
  const O = m.outputs.length;
  const N = m.components.length;
  const samples: Float64Array[] = Array.from({ length: O }, () => new Float64Array(trials));
  const rng = xoshiro128ss(seed);
  const draw = new Float64Array(N);
  // each component's distribution and scale, read once (the loop runs a million times)
  const rectangular = Uint8Array.from(m.components, (comp) => (comp.dist === 'rectangular' ? 1 : 0));
  const scale = Float64Array.from(m.components, (comp) => comp.scale);
  for (let t = 0; t < trials; t++) {
    for (let c = 0; c < N; c++)
      draw[c] = rectangular[c] ? (2 * rng.next() - 1) * scale[c] : rng.normal() * scale[c];
    const out = m.evaluate(draw);
    for (let o = 0; o < O; o++) samples[o][t] = out[o];
  }
  return samples;
}

/**
 * Composition, phi and diluent fraction of a logged batch with their GUM and Monte
 * Carlo uncertainties. The trials run as MC_STREAMS streams one after another, unless
 * the caller passes the streams' samples (computed in parallel with monteCarloSamples).
 * `diluent` names the species counted in the diluent fraction
 * (the design's diluent group; the inerts when there is no design).
 */
export function evaluateUncertainty(
  readings: readonly CheckedReading[],
  settings: UncertaintySettings,
  diluent?: readonly string[],
  initial?: { composition: Fractions; pressurePa: number; temperatureK: number },
  streams?: readonly Float64Array[][],
): UncertaintyResult {
  const dil = diluent ?? defaultDiluent(readings);
  const m = buildModel({ readings, settings, diluent: dil, initial });
  const N = m.components.length;
  const nominalV = new Float64Array(N);
  const nominal = Float64Array.from(m.evaluate(nominalV));
  const nominalUnid = invertReadings(
    m.setup,
    undefined,
    readings.map((r) => r.pressurePa),
  ).unidentified;
  const O = nominal.length;
  const contrib: number[][] = Array.from({ length: O }, () => []);
  const v = new Float64Array(N);
  for (let c = 0; c < N; c++) {
    const u = m.components[c].u;
    v.fill(0);
    v[c] = u;
    const up = Float64Array.from(m.evaluate(v));
    v[c] = -u;
    const dn = m.evaluate(v);
    for (let o = 0; o < O; o++) contrib[o].push((up[o] - dn[o]) / 2);
  }
  // Monte Carlo: the streams' samples joined
  const M = settings.trials;
  const parts =
    streams ??
    (M > 0
      ? Array.from({ length: MC_STREAMS }, (_, i) =>
          drawSamples(m, streamTrials(M, i), streamSeed(settings.seed, i)),
        )
      : []);
  const samples: Float64Array[] = Array.from({ length: O }, () => new Float64Array(M));
  let offset = 0;
  for (const part of parts) {
    for (let o = 0; o < O; o++) samples[o].set(part[o], offset);
    offset += part[0]?.length ?? 0;
  }
  if (M > 0 && offset !== M) throw new Error(`Monte Carlo streams hold ${offset} trials, not ${M}`);
  const stat = (o: number): OutputStat => {
    const value = nominal[o];
    const cs = contrib[o];
    const u = Math.sqrt(cs.reduce((a, b) => a + b * b, 0));
    const budget = cs
      .map((c, i) => ({ name: m.components[i].name, contribution: Math.abs(c) }))
      .filter((b) => b.contribution > 0)
      .sort((a, b) => b.contribution - a.contribution)
      .slice(0, 5);
    let mc: OutputStat['mc'];
    if (M > 1) {
      const s = samples[o];
      let mean = 0;
      for (let i = 0; i < M; i++) mean += s[i];
      mean /= M;
      let v2 = 0;
      for (let i = 0; i < M; i++) v2 += (s[i] - mean) ** 2;
      const uMc = Math.sqrt(v2 / (M - 1));
      const low = percentile(s, 0.025);
      const high = percentile(s, 0.975);
      const tol = numericalTolerance(u);
      const validated = Math.abs(value - 2 * u - low) <= tol && Math.abs(value + 2 * u - high) <= tol;
      mc = { mean, u: uMc, low, high, validated, tolerance: tol };
    }
    return { value, u, low: value - 2 * u, high: value + 2 * u, mc, budget, contributions: cs };
  };
  const S = m.setup.species.length;
  const composition: Record<string, OutputStat> = {};
  for (let i = 0; i < S; i++) composition[m.setup.species[i]] = stat(i);
  const phiStat = Number.isFinite(nominal[S]) ? stat(S) : undefined;
  return {
    species: m.setup.species,
    composition,
    phi: phiStat,
    diluentFraction: dil.length ? stat(S + 1) : undefined,
    unidentified: nominalUnid,
    components: m.components,
    trials: M,
    seed: settings.seed,
  };
}
