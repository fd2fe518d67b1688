/**
 * Flammability of a tank state on the fuel / O2 / inert diagram, by two methods,
 * and the more conservative verdict:
 *  1. the limit envelope: fuel blends by Le Chatelier (LFL, UFL, UFL in O2, LOC),
 *     inerts converted to N2-equivalent with the ISO 10156:2017 coefficients, and the
 *     envelope polygon {LFL in O2, LFL in air, nose at the LOC, UFL in air, UFL in O2}
 *     (Zabetakis 1965; Crowl & Louvar 2001);
 *  2. the calculated adiabatic flame temperature: complete combustion, NASA data; a
 *     state is flammable when its flame temperature reaches the limit flame
 *     temperature of its fuel, calibrated on its listed limits: the flame temperature
 *     at the LFL in air, at the nose (stoichiometric, O2 at the listed LOC) and at the
 *     UFL (in air, and in O2 where it is on file). The side of stoichiometric decides
 *     which: lean states (equivalence ratio phi <= 1) ramp in phi from the LFL
 *     calibration to the nose one at phi = 1; rich states ramp from the nose to the UFL
 *     calibration (interpolated with the oxygen share of the oxidizer), never against
 *     the LFL calibration alone. A fuel without a finite UFL (acetylene: 100 %) has no
 *     rich calibration; its rich states are judged by the envelope alone.
 */
import { FUEL_SAFETY, INERT_K, type FuelSafetyRecord } from './data/safety-data.js';
import { FLAMMABILITY_DATA_MARGIN, INERT_K_FALLBACK, MARGINS, NEAR_LIMIT_FLAME_SHARE } from './thresholds.js';
import { getSpecies } from './lookup.js';
import type { SpeciesRecord } from './data/species.js';
import { oxygenDemand } from './formula.js';
import { flameTemperatureK } from './combustion.js';
import type { Fractions } from './composition.js';
import {
  leanThresholdK,
  limitFlameTemperatureK,
  locFlameTemperatureK,
  richLimitCalibration,
  richThresholdK,
} from './limit-flame.js';

export {
  limitFlameTemperatureK,
  locFlameTemperatureK,
  richLimitCalibration,
  type RichCalibration,
} from './limit-flame.js';

/**
 * 'within-margin': outside the listed limits, but inside them lowered by the data's uncertainty
 * margin (FLAMMABILITY_DATA_MARGIN): not shown non-flammable; 'near-limit': inside the NFPA 69
 * operating margins only
 */
export type Verdict = 'flammable' | 'within-margin' | 'near-limit' | 'non-flammable';

const RANK: Record<Verdict, number> = {
  'non-flammable': 0,
  'near-limit': 1,
  'within-margin': 2,
  flammable: 3,
};
export function worseVerdict(a: Verdict, b: Verdict): Verdict {
  return RANK[a] >= RANK[b] ? a : b;
}

/** O2 in air on the diagram's air line */
const AIR_O2 = 0.21;

export interface BlendLimits {
  readonly lfl: number;
  readonly ufl: number;
  readonly uflO2: number;
  readonly loc: number;
  /** mol O2 per mol fuel blend, stoichiometric */
  readonly z: number;
  /** fuels whose limit data are missing or estimated: the review says so */
  readonly estimated: readonly string[];
  readonly missing: readonly string[];
  readonly sources: readonly string[];
}

/**
 * Le Chatelier's rule: L_mix = 1 / sum(y_i / L_i), y_i the fractions of the fuel alone.
 * Example: leChatelier([{ fraction: 0.008, limit: 0.011 }, { fraction: 0.02, limit: 0.05 },
 *   { fraction: 0.005, limit: 0.027 }]) -> 2.51 % (a textbook blend, 0.8 % hexane, 2.0 % methane and
 *   0.5 % ethylene with LFL 1.1, 5.0 and 2.7 %: 3.3 / (0.8/1.1 + 2.0/5.0 + 0.5/2.7) = 2.514 % by hand;
 *   Crowl & Louvar 2001, from memory: 2.5 %).
 */
export function leChatelier(parts: readonly { fraction: number; limit: number }[]): number {
  const s = parts.reduce((a, p) => a + p.fraction, 0);
  return s / parts.reduce((a, p) => a + p.fraction / p.limit, 0);
}

/**
 * Limits of a fuel blend (fractions of the fuel alone) at temperature T and pressure P.
 * Le Chatelier: L_mix = 1 / sum(y_i / L_i), the same form for UFL, UFL in O2 and LOC
 * (Zlochower & Green 2009 for LOC); fuels with a LOC of 0 (acetylene) scale the LOC of the
 * others by the others' share instead of forcing it to 0. The lower listed LFL and higher listed UFL are used.
 * T above 25 degC widens both limits by 8 % per 100 K (modified Burgess-Wheeler);
 * P above 1 atm raises UFL by 20.6 (log10 P/MPa + 1) vol % (Zabetakis). Neither
 * narrows the limits below 25 degC or 1 atm (that would not be conservative).
 * Fuels without data make the result undefined for them: they are listed in `missing`.
 */
/**
 * A fuel's listed limits as blendLimits takes them (the lower LFL, the higher UFL) and its sources
 * in the order blendLimits names them (LFL, UFL, UFL in O2, LOC), worked out once per table record:
 * the search assesses thousands of states. Keyed by the record itself, so a changed record is
 * worked out again.
 */
const listedOf = new WeakMap<FuelSafetyRecord, { lfl: number; ufl: number; listed: readonly string[] }>();
function listedLimits(rec: FuelSafetyRecord): { lfl: number; ufl: number; listed: readonly string[] } {
  let l = listedOf.get(rec);
  if (!l) {
    const listed = [...rec.lflAir.map((v) => v.source), ...rec.uflAir.map((v) => v.source)];
    if (rec.uflO2) listed.push(rec.uflO2.source);
    if (rec.loc) listed.push(rec.loc.source);
    l = {
      lfl: Math.min(...rec.lflAir.map((v) => v.value)),
      ufl: Math.max(...rec.uflAir.map((v) => v.value)),
      listed,
    };
    listedOf.set(rec, l);
  }
  return l;
}

function computeBlendBase(
  fuel: Fractions,
  species: SpeciesRecord[],
  recs: (FuelSafetyRecord | undefined)[],
): BlendBase {
  let invL = 0;
  let invU = 0;
  let invUO2 = 0;
  let invLoc = 0;
  /** share of the (known) fuel whose LOC is above 0 */
  let locShare = 0;
  let z = 0;
  const estimated: string[] = [];
  const missing: string[] = [];
  const sources = new Set<string>();
  let known = 0;
  for (const [k, y] of Object.entries(fuel)) {
    const sp = getSpecies(k);
    const d = oxygenDemand(sp.elements);
    species.push(sp);
    z += y * d;
    const rec = FUEL_SAFETY.get(k);
    recs.push(rec);
    if (!rec) {
      missing.push(k);
      continue;
    }
    known += y;
    const { lfl, ufl, listed } = listedLimits(rec);
    for (const s of listed) sources.add(s);
    let uflO2: number;
    if (rec.uflO2) {
      uflO2 = rec.uflO2.value;
    } else {
      // no measured limit in O2: a wide estimate (UFL in O2 is 3-6x UFL in air for these fuels)
      uflO2 = Math.min(0.95, Math.max(0.6, 4 * ufl));
      estimated.push(`${k} (UFL in O2)`);
    }
    let loc: number;
    if (rec.loc) {
      loc = rec.loc.value;
    } else {
      const raw = d * lfl;
      loc = raw >= 0.1 ? raw - 0.02 : raw * 0.85;
      estimated.push(`${k} (LOC = z x LFL)`);
      sources.add('loc-estimate');
    }
    invL += y / lfl;
    invU += y / ufl;
    invUO2 += y / uflO2;
    if (loc > 0) {
      invLoc += y / loc;
      locShare += y;
    }
  }
  const scale = known > 0 ? known : 1;
  const lfl = scale / invL;
  const ufl = scale / invU;
  const uflO2 = scale / invUO2;
  // a LOC of 0 (acetylene: it decomposes without oxidant) would make Le Chatelier's mean 0 for
  // any share of it; instead the fuels with a LOC take their Le Chatelier mean, scaled by their
  // share of the fuel (our rule, linear in the share of the decomposing fuel): 1 % C2H2 in CH4
  // gives 0.99 x 10.7 %, pure C2H2 stays 0
  const loc = invLoc > 0 ? (locShare / invLoc) * (locShare / scale) : 0;
  return { lfl, ufl, uflO2, loc, z, estimated, missing, sources: [...sources], species, recs };
}

/** the limits of a blend before the temperature and pressure corrections, and what they rest on */
interface BlendBase extends BlendLimits {
  readonly species: readonly SpeciesRecord[];
  readonly recs: readonly (FuelSafetyRecord | undefined)[];
}
/** blend bases by the blend's names and fractions: a path's states share their fuel blend */
const blendBases = new Map<string, BlendBase>();
const BLEND_BASES_KEPT = 256;

function blendBase(fuel: Fractions): BlendBase {
  let key = '';
  for (const k in fuel) key += `${k}\u0000${fuel[k]}\u0000`;
  const hit = blendBases.get(key);
  // still the tables' records (a test may change a table): else computed again
  if (hit) {
    let i = 0;
    let same = true;
    for (const k in fuel) {
      if (FUEL_SAFETY.get(k) !== hit.recs[i] || getSpecies(k) !== hit.species[i]) same = false;
      i++;
    }
    if (same) return hit;
  }
  const base = computeBlendBase(fuel, [], []);
  if (blendBases.size >= BLEND_BASES_KEPT) blendBases.clear();
  blendBases.set(key, base);
  return base;
}

/**
 * above 1 atm the UFL rises with pressure (blendLimits); at or below it a blend's limits do not depend
 * on the pressure
 */
export function uflRisesWithPressure(pressurePa: number): boolean {
  return pressurePa / 1e6 > 0.101325;
}

export function blendLimits(fuel: Fractions, temperatureK: number, pressurePa: number): BlendLimits {
  const b = blendBase(fuel);
  let lfl = b.lfl;
  let ufl = b.ufl;
  const uflO2 = b.uflO2;
  const dT = temperatureK - 298.15;
  if (dT > 0) {
    lfl *= 1 - 0.0008 * dT;
    ufl *= 1 + 0.0008 * dT;
  }
  const pMPa = pressurePa / 1e6;
  if (uflRisesWithPressure(pressurePa))
    ufl = Math.min(uflO2, ufl + 0.206 * (Math.log10(pMPa) + 1) - 0.206 * (Math.log10(0.101325) + 1));
  const { loc, z, estimated, missing, sources } = b;
  return { lfl, ufl: Math.min(ufl, 1), uflO2, loc, z, estimated, missing, sources };
}

export interface DiagramPoint {
  /** fuel mole fraction on the diagram (after N2-equivalent conversion and renormalising) */
  readonly fuel: number;
  readonly oxygen: number;
  readonly inert: number;
}

/**
 * A state as a point of the fuel / O2 / N2-equivalent diagram. Inerts count as
 * K x their amount of N2 (ISO 10156:2017); oxygen carriers as their O2 equivalent
 * (N2O and NO: half a mole of O2, their N2 as inert).
 */
export function diagramPoint(y: Fractions): {
  point: DiagramPoint;
  fuelBlend: Record<string, number>;
  unknownInerts: string[];
} {
  const { fuel: f, oxygen: o, inert: n, fuelBlend, unknownInerts } = diagramSums(y);
  const s = f + o + n;
  for (const k of Object.keys(fuelBlend)) fuelBlend[k] /= f;
  return { point: { fuel: f / s, oxygen: o / s, inert: n / s }, fuelBlend, unknownInerts };
}

/**
 * The diagram's amounts before normalising: fuel, O2-equivalent and N2-equivalent inert per mol of
 * the state, and each fuel's amount. They are linear in the composition (a mixing path's are linear
 * in its position).
 */
export function diagramSums(y: Fractions): DiagramPoint & {
  fuelBlend: Record<string, number>;
  unknownInerts: string[];
} {
  let f = 0;
  let o = 0;
  let n = 0;
  const fuelBlend: Record<string, number> = {};
  const unknownInerts: string[] = [];
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    const el = getSpecies(k).elements;
    const d = oxygenDemand(el);
    if (d > 0) {
      f += v;
      fuelBlend[k] = v;
    } else if (d < 0) {
      o += -d * v;
      n += ((el.N ?? 0) / 2) * v; // N2O -> N2 + 1/2 O2
    } else {
      const K = INERT_K.get(k);
      if (!K) unknownInerts.push(k);
      n += (K?.value ?? INERT_K_FALLBACK) * v;
    }
  }
  return { fuel: f, oxygen: o, inert: n, fuelBlend, unknownInerts };
}

/** vertices closer than this (mole fraction) are one vertex */
const VERTEX_EPS = 1e-12;

/**
 * The envelope polygon in (fuel, oxygen) coordinates, without repeated vertices:
 * a LOC of 0 puts the nose on the fuel axis, and a UFL of 100 % in air and in O2 (acetylene)
 * puts both UFL vertices on the fuel corner (1, 0); equal neighbours are merged so that no
 * edge has zero length.
 */
export function envelopePolygon(l: BlendLimits): [number, number][] {
  const noseFuel = l.z > 0 ? Math.max(l.lfl, l.loc / l.z) : l.lfl;
  const raw: [number, number][] = [
    [l.lfl, 1 - l.lfl], // LFL in O2 (about the LFL in air)
    [l.lfl, AIR_O2 * (1 - l.lfl)], // LFL in air
    [Math.min(noseFuel, l.ufl), Math.min(l.loc, AIR_O2 * (1 - l.lfl))], // nose at the LOC
    [l.ufl, AIR_O2 * (1 - l.ufl)], // UFL in air
    [l.uflO2, 1 - l.uflO2], // UFL in O2
  ];
  const same = (a: [number, number], b: [number, number]) =>
    (a[0] - b[0]) ** 2 + (a[1] - b[1]) ** 2 < VERTEX_EPS ** 2;
  const out: [number, number][] = [];
  for (const v of raw) if (!out.length || !same(out[out.length - 1], v)) out.push(v);
  while (out.length > 1 && same(out[0], out[out.length - 1])) out.pop();
  return out;
}

/**
 * The UFL at a state's oxygen share r = O2 / (O2 + N2-equivalent inert): where the line
 * from the fuel corner through the state meets the rich edge of the envelope (nose ->
 * UFL in air -> UFL in O2). r = 0.21 gives the UFL in air, r = 1 the UFL in O2; below the
 * nose's share the line misses the envelope and the result is undefined.
 */
export function uflAtOxygenShare(l: BlendLimits, r: number): number | undefined {
  const noseFuel = l.z > 0 ? Math.max(l.lfl, l.loc / l.z) : l.lfl;
  const chain: [number, number][] = [
    [Math.min(noseFuel, l.ufl), Math.min(l.loc, AIR_O2 * (1 - l.lfl))],
    [l.ufl, AIR_O2 * (1 - l.ufl)],
    [l.uflO2, 1 - l.uflO2],
  ];
  let best: number | undefined;
  for (let i = 0; i + 1 < chain.length; i++) {
    const [a, b] = [chain[i], chain[i + 1]];
    // g(t) = o(t) - r (1 - u(t)), linear in t
    const g0 = a[1] - r * (1 - a[0]);
    const g1 = b[1] - r * (1 - b[0]);
    if (g0 === g1) continue;
    const t = g0 / (g0 - g1);
    if (t < -1e-12 || t > 1 + 1e-12) continue;
    const u = a[0] + t * (b[0] - a[0]);
    if (best === undefined || u > best) best = u;
  }
  return best;
}

/**
 * The lean boundary of the envelope at a state's O2 fraction: the fuel fraction on the edge from the
 * LFL in air to the nose at the LOC, where that edge spans this O2 (between the LOC and the O2 of the
 * LFL in air); elsewhere the LFL (above) or the LOC (below) is the boundary itself, and the result is
 * undefined.
 * Example: leanLimitAtOxygen({ lfl: 0.023, ufl: 0.36, uflO2: 0.8, loc: 0.085, z: 3, estimated: [],
 *   missing: [], sources: [] }, 0.142) -> 0.02580 (by hand: the edge from (2.3 %, 0.21 x 0.977 =
 *   20.517 %) to the nose (8.5 % / 3 = 2.833 %, 8.5 %) at 14.2 % O2: 2.3 + 0.52567 x 0.5333 = 2.580 %).
 */
export function leanLimitAtOxygen(l: BlendLimits, oxygen: number): number | undefined {
  const noseFuel = l.z > 0 ? Math.max(l.lfl, l.loc / l.z) : l.lfl;
  const airO2 = AIR_O2 * (1 - l.lfl);
  const noseO2 = Math.min(l.loc, airO2);
  if (!(oxygen > noseO2 && oxygen < airO2) || noseFuel <= l.lfl) return undefined;
  const t = (airO2 - oxygen) / (airO2 - noseO2);
  return l.lfl + t * (Math.min(noseFuel, l.ufl) - l.lfl);
}

function onSegment(p: [number, number], a: [number, number], b: [number, number]): boolean {
  const len = Math.sqrt((b[0] - a[0]) ** 2 + (b[1] - a[1]) ** 2);
  // a zero-length edge (two equal vertices) holds only its own point
  if (len < VERTEX_EPS) return (p[0] - a[0]) ** 2 + (p[1] - a[1]) ** 2 < VERTEX_EPS ** 2;
  const cross = (b[0] - a[0]) * (p[1] - a[1]) - (b[1] - a[1]) * (p[0] - a[0]);
  if (Math.abs(cross) > 1e-9 * Math.max(len, 1e-12)) return false;
  const dot = (p[0] - a[0]) * (b[0] - a[0]) + (p[1] - a[1]) * (b[1] - a[1]);
  return dot >= -1e-12 && dot <= len * len + 1e-12;
}

/** inside or on the boundary (an undiluted fuel/O2 state lies on the fuel-O2 edge) */
export function insidePolygon(p: [number, number], poly: [number, number][]): boolean {
  for (let i = 0, j = poly.length - 1; i < poly.length; j = i++)
    if (onSegment(p, poly[j], poly[i])) return true;
  let inside = false;
  for (let i = 0, j = poly.length - 1; i < poly.length; j = i++) {
    const [xi, yi] = poly[i];
    const [xj, yj] = poly[j];
    if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/** how far a state lies from the flammable region, in the terms of each limit */
export interface FlammabilityDistance {
  /** equivalence ratio on the diagram: z x fuel / O2 (O2 carriers as their O2 equivalent) */
  readonly equivalenceRatio: number;
  readonly side: 'lean' | 'rich';
  /** fuel / LFL of the blend */
  readonly fuelOverLfl: number;
  /** O2 on the diagram / LOC; undefined when the LOC is 0 */
  readonly oxygenOverLoc?: number;
  /** O2 share of the oxidizer side, O2 / (O2 + N2-equivalent inert): 0.21 in air, 1 in O2 */
  readonly oxygenShare: number;
  /** the envelope's UFL at this oxygen share; undefined below the nose */
  readonly uflHere?: number;
  /** fuel / uflHere */
  readonly fuelOverUfl?: number;
  /** the lean boundary's fuel fraction at this O2, where it is the edge to the nose (leanLimitAtOxygen) */
  readonly leanLimitHere?: number;
  /**
   * a state inside the data's uncertainty margin by the envelope: the share by which the LFL and the
   * LOC would have to be lower for the envelope to hold it (0.077: 7.7 % lower)
   */
  readonly limitsLowerBy?: number;
  /** by flame temperature: its temperature rise over the limit flame's (1 at the limit) */
  readonly flameRiseShare?: number;
}

export interface FlammabilityAssessment {
  readonly verdict: Verdict;
  readonly byEnvelope: Verdict;
  readonly byFlameTemperature: Verdict;
  readonly point: DiagramPoint;
  readonly limits?: BlendLimits;
  readonly flameK?: number;
  /** the limit flame temperature this state was judged against (lean or rich calibration) */
  readonly limitFlameK?: number;
  /** set on rich states: which calibration the flame-temperature method used */
  readonly richCalibration?: 'ufl-air' | 'ufl-air-and-o2' | 'none';
  readonly distance?: FlammabilityDistance;
  readonly unknownInerts: readonly string[];
}

/** is the point inside the envelope with the LFL and the LOC lowered by the share `by` */
function insideLowered(point: DiagramPoint, limits: BlendLimits, by: number): boolean {
  const lowered = { ...limits, lfl: limits.lfl * (1 - by), loc: limits.loc * (1 - by) };
  return insidePolygon([point.fuel, point.oxygen], envelopePolygon(lowered));
}

/**
 * the smallest share by which the LFL and the LOC must be lowered for the envelope to hold a point
 * inside the data margin (bisection to 1e-6 of the share; the envelope grows as the limits fall)
 */
function lowerByToHold(point: DiagramPoint, limits: BlendLimits): number {
  let lo = 0;
  let hi: number = DATA_MARGIN;
  while (hi - lo > 1e-6) {
    const mid = (lo + hi) / 2;
    if (insideLowered(point, limits, mid)) hi = mid;
    else lo = mid;
  }
  return hi;
}

/**
 * the flammability data's uncertainty margin (thresholds.ts FLAMMABILITY_DATA_MARGIN, common
 * practice: handbook LFL and LOC values scatter by around 10 %): the envelope with the LFL and the
 * LOC lowered by it, and the limit flame temperature rise lowered by it, bound 'within-margin'
 */
const DATA_MARGIN = FLAMMABILITY_DATA_MARGIN;

/** flame-temperature margin for "near the limit": a share of the limit temperature rise (thresholds.ts) */
const FLAME_MARGIN = NEAR_LIMIT_FLAME_SHARE;

/**
 * the envelope's verdict: inside the polygon flammable; inside it with the LFL and the LOC lowered by
 * the data margin 'within-margin' (with how much lower holds it); inside the NFPA 69 margins 'near-limit'
 */
function envelopeVerdict(
  point: DiagramPoint,
  limits: BlendLimits,
): { byEnvelope: Verdict; limitsLowerBy?: number } {
  if (insidePolygon([point.fuel, point.oxygen], envelopePolygon(limits))) return { byEnvelope: 'flammable' };
  if (insideLowered(point, limits, DATA_MARGIN))
    return { byEnvelope: 'within-margin', limitsLowerBy: lowerByToHold(point, limits) };
  const locNear =
    limits.loc >= MARGINS.lowLocBelow ? limits.loc - MARGINS.locOffset : limits.loc * MARGINS.locFractionLow;
  const near =
    point.fuel >= MARGINS.lflFraction * limits.lfl && point.oxygen >= locNear && point.fuel <= limits.uflO2;
  return { byEnvelope: near ? 'near-limit' : 'non-flammable' };
}

/**
 * A state's flame temperature and the limit flame temperature it is judged against: the fuel-weighted
 * mean of its fuels' limits, lean or rich by phi (on the rich side only fuels whose rich limit is
 * calibrated on a UFL below 100 % count); neither when no fuel of the blend has a limit flame.
 */
function flameAgainstLimit(
  y: Fractions,
  temperatureK: number,
  fuelBlend: Readonly<Record<string, number>>,
  phi: number,
  side: 'lean' | 'rich',
  oxygenShare: number,
): Pick<FlammabilityAssessment, 'flameK' | 'limitFlameK' | 'richCalibration'> {
  let limitFlameK = 0;
  let wsum = 0;
  let richCalibration: FlammabilityAssessment['richCalibration'];
  if (side === 'lean') {
    for (const [k, w] of Object.entries(fuelBlend)) {
      const t = limitFlameTemperatureK(k);
      if (t !== undefined) {
        limitFlameK += w * leanThresholdK(k, t, phi);
        wsum += w;
      }
    }
  } else {
    let withO2 = false;
    for (const [k, w] of Object.entries(fuelBlend)) {
      const lean = limitFlameTemperatureK(k);
      const c = richLimitCalibration(k);
      if (lean === undefined || !c) continue;
      if (c.oxygen) withO2 = true;
      limitFlameK += w * richThresholdK(c, locFlameTemperatureK(k) ?? lean, phi, oxygenShare);
      wsum += w;
    }
    richCalibration = wsum > 0 ? (withO2 ? 'ufl-air-and-o2' : 'ufl-air') : 'none';
  }
  if (!(wsum > 0)) return { richCalibration };
  return { limitFlameK: limitFlameK / wsum, richCalibration, flameK: flameTemperatureK(y, temperatureK) };
}

/**
 * A state's flame temperature rise as a share of the rise to its limit flame temperature (1 at the
 * limit; 0 without a flame or a limit), the numbers assessFlammability judges it by, without the
 * rest of the assessment (a search for the hottest point of a path needs only these)
 */
export function flameShareToLimit(y: Fractions, temperatureK: number): number {
  const { point, fuelBlend } = diagramPoint(y);
  if (Object.keys(fuelBlend).length === 0 || point.oxygen <= 0) return 0;
  // phi as assessFlammability has it: z is the blend's, whatever the temperature and pressure
  const phi = (blendBase(fuelBlend).z * point.fuel) / point.oxygen;
  const side = phi > 1 ? 'rich' : 'lean';
  const oxygenShare = point.oxygen / (point.oxygen + point.inert);
  return flameShareOf(flameAgainstLimit(y, temperatureK, fuelBlend, phi, side, oxygenShare), temperatureK);
}

/** an assessment's flame temperature rise as a share of the rise to its limit flame temperature (flameShareToLimit) */
export function flameShareOf(
  a: Pick<FlammabilityAssessment, 'flameK' | 'limitFlameK'>,
  temperatureK: number,
): number {
  if (a.flameK === undefined || a.limitFlameK === undefined) return 0;
  return (a.flameK - temperatureK) / Math.max(a.limitFlameK - 298.15, 1);
}

export function assessFlammability(
  y: Fractions,
  temperatureK: number,
  pressurePa: number,
): FlammabilityAssessment {
  const { point, fuelBlend, unknownInerts } = diagramPoint(y);
  const hasFuel = Object.keys(fuelBlend).length > 0;
  if (!hasFuel || point.oxygen <= 0) {
    return {
      verdict: 'non-flammable',
      byEnvelope: 'non-flammable',
      byFlameTemperature: 'non-flammable',
      point,
      unknownInerts,
    };
  }
  const limits = blendLimits(fuelBlend, temperatureK, pressurePa);
  // which side of stoichiometric, and how far from each limit
  const phi = (limits.z * point.fuel) / point.oxygen;
  const side: 'lean' | 'rich' = phi > 1 ? 'rich' : 'lean';
  const oxygenShare = point.oxygen / (point.oxygen + point.inert);
  const uflHere = uflAtOxygenShare(limits, oxygenShare);
  const base: FlammabilityDistance = {
    equivalenceRatio: phi,
    side,
    fuelOverLfl: point.fuel / limits.lfl,
    oxygenOverLoc: limits.loc > 0 ? point.oxygen / limits.loc : undefined,
    oxygenShare,
    uflHere,
    fuelOverUfl: uflHere !== undefined ? point.fuel / uflHere : undefined,
    leanLimitHere: side === 'lean' ? leanLimitAtOxygen(limits, point.oxygen) : undefined,
  };
  const { byEnvelope, limitsLowerBy } = envelopeVerdict(point, limits);
  const flame = flameAgainstLimit(y, temperatureK, fuelBlend, phi, side, oxygenShare);
  const { limitFlameK, richCalibration, flameK } = flame;
  let byFlameTemperature: Verdict = 'non-flammable';
  if (flameK !== undefined && limitFlameK !== undefined) {
    if (flameK >= limitFlameK) byFlameTemperature = 'flammable';
    // lean (fuel-limited) side: the limit flame temperature is calibrated on the LFL and the LOC, and
    // the rise of a lean flame is about proportional to its fuel, so their margin is one of the rise;
    // not on the rich side, where the rise hardly falls with excess fuel (the UFL has no margin here)
    else if (side === 'lean' && flameK - temperatureK >= (1 - DATA_MARGIN) * (limitFlameK - 298.15))
      byFlameTemperature = 'within-margin';
    else if (flameK - temperatureK >= FLAME_MARGIN * (limitFlameK - 298.15))
      byFlameTemperature = 'near-limit';
  }
  const distance: FlammabilityDistance = {
    ...base,
    ...(limitsLowerBy !== undefined ? { limitsLowerBy } : {}),
    ...(byFlameTemperature === 'within-margin'
      ? { flameRiseShare: (flameK! - temperatureK) / (limitFlameK! - 298.15) }
      : {}),
  };
  // a fuel without limit data cannot be judged non-flammable
  let verdict = worseVerdict(byEnvelope, byFlameTemperature);
  if (limits.missing.length && verdict === 'non-flammable') verdict = 'near-limit';
  return {
    verdict,
    byEnvelope,
    byFlameTemperature,
    point,
    limits,
    flameK,
    limitFlameK,
    richCalibration,
    distance,
    unknownInerts,
  };
}
