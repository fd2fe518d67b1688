import { describe, expect, it } from 'vitest';
import { designMixture, diagramPoint, planFill, pureCylinder, type Gauge } from '../../src/core/index.js';
import { diagramData, diagramSvg, detailSvg } from '../../src/report/diagram.js';
import { TORR } from '../helpers.js';

const head = (id: string, fsTorr: number, res: number): Gauge => ({
  id,
  label: id,
  reference: 'absolute',
  fullScalePa: fsTorr * TORR,
  minimumPa: 0,
  accuracyOfReading: 0.0012,
  accuracyOfFullScale: 0,
  resolutionPa: res * TORR,
  unit: 'Torr',
});
const plan = (x: Record<string, number>, order: string[]) =>
  planFill({
    design: designMixture({ kind: 'fractions', fractions: x }),
    finalPressurePa: 1000 * TORR,
    temperatureK: 298.15,
    tank: { id: 'T', label: 'T', volumeM3: 0.01, ratedPressurePa: 20e5, workingFraction: 0.9 },
    sources: order.map((s) => pureCylinder({ id: s, species: s, purity: 1 })),
    order: 'given',
    gauges: [head('h1k', 1000, 0.01), head('h10k', 10000, 0.1)],
    reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
    tolerance: { relative: 0.005, absolute: 0 },
  });

describe('the diagram draws each fill as a segment with its flammable stretch', () => {
  it('O2 first, then CH4 to 90/10: the CH4 fill is drawn from state 1 to 2 with a detonable stretch on it, from about the LFL (4.4 %, IEC 60079-20-1) on the O2 edge', () => {
    const p = plan({ CH4: 0.9, O2: 0.1 }, ['O2', 'CH4']);
    const d = diagramData(p)!;
    expect(d.path.map((q) => q.label)).toEqual(['1', '2']);
    expect(d.flammable.length).toBe(1);
    const b = d.flammable[0];
    expect(b.step).toBe(2);
    expect(b.detonable).toBe(true);
    // undiluted CH4/O2: every point of the path lies on the fuel-O2 edge (fuel + oxygen = 1)
    for (const q of [b.from, b.to]) expect(q.fuel + q.oxygen).toBeCloseTo(1, 6);
    expect(b.from.fuel).toBeGreaterThan(0.04);
    expect(b.from.fuel).toBeLessThan(0.06);
    expect(b.to.fuel).toBeGreaterThan(0.5);
    expect(b.to.fuel).toBeLessThan(diagramPoint(p.steps[1].compositionAfter).point.fuel);
    const svg = diagramSvg(d, 't');
    expect(svg.match(/class="burn"/g)?.length).toBe(2); // the stretch and its legend key
    expect(svg).toContain('flammable during a fill');
    expect(detailSvg(d, 't')).toContain('class="burn"');
  });

  it('a fill order that stays outside the region draws no stretch (N2, CH4, then O2 to 2 % CH4 in synthetic air; LFL 4.4 %, IEC 60079-20-1)', () => {
    const d = diagramData(plan({ CH4: 0.02, O2: 0.2, N2: 0.78 }, ['N2', 'CH4', 'O2']))!;
    expect(d.flammable).toEqual([]);
    expect(diagramSvg(d, 't')).not.toContain('class="burn"');
  });
});

describe('the caption of a state outside the detail', () => {
  // 11 px sans-serif: descenders reach about 0.25 em below the baseline (typical of sans-serif
  // faces, from memory); the caption must end above the frame and not run past its right edge
  const DESCENT = 0.25 * 11;
  const frameOf = (svg: string) => {
    const m = /<rect x="([\d.]+)" y="([\d.]+)" width="([\d.]+)" height="[\d.]+" class="edge"\/>/.exec(svg)!;
    return { x: Number(m[1]), y: Number(m[2]), right: Number(m[1]) + Number(m[3]) };
  };

  it('CH4 first (pure fuel, off the detail): the caption sits clear above the frame and ends at its right edge', () => {
    const svg = detailSvg(diagramData(plan({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'Ar', 'O2']))!, 't');
    const cap = /<text x="([\d.]+)" y="([\d.]+)"[^>]*>state 1 outside this detail/.exec(svg);
    expect(cap).not.toBeNull();
    const frame = frameOf(svg);
    expect(Number(cap![2]) + DESCENT).toBeLessThan(frame.y);
    expect(Number(cap![1])).toBeLessThanOrEqual(frame.right);
  });

  it('Ar first (every state inside the detail): no caption, and the frame keeps its top', () => {
    const svg = detailSvg(diagramData(plan({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['Ar', 'CH4', 'O2']))!, 't');
    expect(svg).not.toContain('outside this detail');
    expect(frameOf(svg).y).toBe(14);
  });
});
