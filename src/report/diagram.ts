/**
 * The fuel / O2 / inert diagram as an SVG string: an equilateral triangle with the
 * inert (N2-equivalent) vertex bottom left, O2 bottom right and fuel at the top; the
 * flammable zone of the batch's fuel from the safety review's envelope, the air line,
 * the stoichiometric line, and the fill path of the tank states, numbered in order.
 * Each fill's path is the straight segment between the states before and after it
 * (mixing is linear in mole fractions, and the N2-equivalent diagram is a projective
 * map of them, so segments stay straight); the stretch of it that the safety review
 * finds flammable is drawn as a wide grey band under the path.
 * Plain strokes, grey and hatching: readable in black and white.
 */
import {
  blendLimits,
  diagramPoint,
  envelopePolygon,
  mix,
  reviewBulkPath,
  type Plan,
  type TankState,
} from '../core/index.js';

/** mole fractions (fuel, oxygen) to unit-triangle coordinates; the inert share is 1 - fuel - oxygen */
export function ternaryXY(fuel: number, oxygen: number): { x: number; y: number } {
  return { x: oxygen + fuel / 2, y: (fuel * Math.sqrt(3)) / 2 };
}

export interface DiagramData {
  readonly envelope: readonly [number, number][];
  readonly lfl: number;
  readonly ufl: number;
  readonly z: number;
  readonly path: readonly { readonly label: string; readonly fuel: number; readonly oxygen: number }[];
  /** the stretches of fill paths where the tank is flammable (from the review of each fill's bulk path) */
  readonly flammable: readonly {
    readonly step: number;
    readonly detonable: boolean;
    readonly from: { readonly fuel: number; readonly oxygen: number };
    readonly to: { readonly fuel: number; readonly oxygen: number };
  }[];
}

export function diagramData(plan: Plan): DiagramData | undefined {
  const final = diagramPoint(plan.steps[plan.steps.length - 1].compositionAfter);
  if (Object.keys(final.fuelBlend).length === 0) return undefined;
  const limits = blendLimits(final.fuelBlend, plan.temperatureK, plan.final.pressurePa);
  const states = [
    ...(plan.initial ? [{ label: '0', y: plan.initial.composition }] : []),
    ...plan.steps.map((s) => ({ label: String(s.index), y: s.compositionAfter })),
  ];
  const flammable: DiagramData['flammable'][number][] = [];
  let before: TankState | undefined = plan.initial
    ? { step: 0, composition: plan.initial.composition, pressurePa: plan.initial.pressurePa, final: false }
    : undefined;
  for (const s of plan.steps) {
    const after: TankState = {
      step: s.index,
      composition: s.compositionAfter,
      pressurePa: s.targetPa,
      final: s.index === plan.steps.length,
    };
    const r = before
      ? reviewBulkPath(
          { step: s.index, sourceId: s.source.id, sourceComposition: s.source.composition, before, after },
          plan.temperatureK,
        )
      : undefined;
    if (r?.flammableU && before) {
      const at = (u: number) => {
        const p = diagramPoint(mix(before!.composition, after.composition, u)).point;
        return { fuel: p.fuel, oxygen: p.oxygen };
      };
      flammable.push({
        step: s.index,
        detonable: r.rank === 2,
        from: at(r.flammableU[0]),
        to: at(r.flammableU[1]),
      });
    }
    before = after;
  }
  return {
    flammable,
    envelope: envelopePolygon(limits),
    lfl: limits.lfl,
    ufl: limits.ufl,
    z: limits.z,
    path: states.map((s) => {
      const p = diagramPoint(s.y).point;
      return { label: s.label, fuel: p.fuel, oxygen: p.oxygen };
    }),
  };
}

const W = 440;
const H = 410;
const M = 40; // margin around the unit triangle, px
const SCALE = W - 2 * M;

function px(fuel: number, oxygen: number): [number, number] {
  const { x, y } = ternaryXY(fuel, oxygen);
  return [M + x * SCALE, H - M - y * SCALE];
}

const f1 = (v: number) => v.toFixed(1);

/** a round tick step for an axis of length `span` with about `n` intervals: 1, 2, 2.5 or 5 times a power of ten */
export function niceStep(span: number, n = 4): number {
  const raw = span / n;
  const mag = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * mag >= raw * (1 - 1e-9)) return m * mag;
  return 10 * mag;
}

/** a percentage tick label without float noise: 0.025 -> "2.5" */
const pctTick = (v: number) => String(Number((v * 100).toFixed(6)));

type Box = { x0: number; y0: number; x1: number; y1: number };
/** boxes closer than this (px) count as touching: "2" and "3" side by side would read as 23 */
const GAP = 4;
const overlaps = (a: Box, b: Box) =>
  a.x0 < b.x1 + GAP && b.x0 < a.x1 + GAP && a.y0 < b.y1 + GAP && b.y0 < a.y1 + GAP;

/** points closer than this (px) share one label, "2,3": separate labels would sit over each other's points */
const CLUSTER_PX = 10;

/**
 * Number labels of the tank states. Points within CLUSTER_PX of an earlier one share its
 * label ("2,3", text empty for the later ones); each label goes to the first of a few
 * spots around its point that overlaps neither a label already placed nor the reserved
 * boxes (axis and vertex labels), so the apex and near-coincident states stay readable.
 */
export function placeNumbers(
  points: readonly { label: string; x: number; y: number }[],
  reserved: readonly Box[],
): { x: number; y: number; text: string }[] {
  const owner = points.map((p, i) =>
    points.findIndex((q, j) => j <= i && Math.hypot(q.x - p.x, q.y - p.y) < CLUSTER_PX),
  );
  const text = points.map((_, i) =>
    owner[i] === i
      ? points
          .filter((_, j) => owner[j] === i)
          .map((q) => q.label)
          .join(',')
      : '',
  );
  const placed: Box[] = [...reserved];
  const spots: [number, number][] = [
    [7, -6],
    [7, 15],
    [-7, -6],
    [-7, 15],
    [11, 5],
    [-11, 5],
    [7, -19],
    [-7, -19],
    [7, 28],
  ];
  return points.map((p, i) => {
    if (!text[i]) return { x: p.x, y: p.y, text: '' };
    const w = 8 * text[i].length;
    const boxAt = (dx: number, dy: number): Box => {
      const x0 = dx >= 0 ? p.x + dx : p.x + dx - w;
      return { x0, y0: p.y + dy - 11, x1: x0 + w, y1: p.y + dy + 2 };
    };
    let best = spots[0];
    for (const sp of spots) {
      if (!placed.some((b) => overlaps(b, boxAt(sp[0], sp[1])))) {
        best = sp;
        break;
      }
    }
    const b = boxAt(best[0], best[1]);
    placed.push(b);
    return { x: b.x0, y: p.y + best[1], text: text[i] };
  });
}

/** a tank state on a diagram: its circle, and its number where placeNumbers put it */
function stateMark(x: number, y: number, spot: { x: number; y: number; text: string }): string {
  const num = spot.text ? `<text x="${f1(spot.x)}" y="${f1(spot.y)}" class="num">${spot.text}</text>` : '';
  return `<circle cx="${f1(x)}" cy="${f1(y)}" r="4.5" class="state"/>${num}`;
}

export function diagramSvg(d: DiagramData, title: string): string {
  const pts = (list: readonly [number, number][]) =>
    list.map(([f, o]) => px(f, o).map(f1).join(',')).join(' ');
  const tri = pts([
    [0, 0],
    [0, 1],
    [1, 0],
  ]);
  const [ax, ay] = px(0, 0.21);
  const [fx, fy] = px(1, 0);
  const stoichFuel = 1 / (1 + d.z);
  const [sx, sy] = px(stoichFuel, 1 - stoichFuel);
  const [ix, iy] = px(0, 0);
  const grid: string[] = [];
  for (let k = 1; k < 10; k++) {
    const t = k / 10;
    // lines of constant fuel fraction
    const [x1, y1] = px(t, 0);
    const [x2, y2] = px(t, 1 - t);
    grid.push(`<line x1="${f1(x1)}" y1="${f1(y1)}" x2="${f1(x2)}" y2="${f1(y2)}" class="grid"/>`);
  }
  const path = d.path.map((p) => px(p.fuel, p.oxygen));
  const pathLine =
    path.length > 1
      ? `<polyline points="${path.map((p) => p.map(f1).join(',')).join(' ')}" class="path"/>`
      : '';
  const burn = d.flammable
    .map((b) => {
      const [x1, y1] = px(b.from.fuel, b.from.oxygen);
      const [x2, y2] = px(b.to.fuel, b.to.oxygen);
      return (
        `<line x1="${f1(x1)}" y1="${f1(y1)}" x2="${f1(x2)}" y2="${f1(y2)}" class="burn"><title>fill ` +
        `${b.step}: ${b.detonable ? 'detonable' : 'flammable'} stretch</title></line>`
      );
    })
    .join('');
  // vertex labels: fuel left of the apex (the state of a pure first fill sits on it); inert and O2
  // on a second row below the O2 scale
  const vertexBoxes: Box[] = [
    { x0: fx - 56, y0: fy - 8, x1: fx - 8, y1: fy + 8 },
    { x0: ix - 4, y0: iy + 4, x1: ix + 90, y1: iy + 32 },
    { x0: M + SCALE - 30, y0: iy + 4, x1: M + SCALE + 6, y1: iy + 32 },
    { x0: ax - 12, y0: iy + 4, x1: ax + 12, y1: iy + 18 },
  ];
  const spots = placeNumbers(
    d.path.map((p, i) => ({ label: p.label, x: path[i][0], y: path[i][1] })),
    vertexBoxes,
  );
  const marks = d.path.map((_, i) => stateMark(path[i][0], path[i][1], spots[i])).join('');
  // the scale: fuel fraction at the left ends of its grid lines, O2 fraction along the base
  const scale: string[] = [];
  for (const t of [0.2, 0.4, 0.6, 0.8]) {
    const [lx0, ly0] = px(t, 0);
    scale.push(
      `<text x="${f1(lx0 - 5)}" y="${f1(ly0 + 4)}" class="tick" text-anchor="end">${pctTick(t)}</text>`,
    );
    if (t >= 0.4) {
      const [bx, by] = px(0, t);
      scale.push(
        `<line x1="${f1(bx)}" y1="${f1(by)}" x2="${f1(bx)}" y2="${f1(by + 4)}" class="edge"/><text ` +
          `x="${f1(bx)}" y="${f1(by + 15)}" class="tick" text-anchor="middle">${pctTick(t)}</text>`,
      );
    }
  }
  const [lx, ly] = px(d.lfl, 0.21 * (1 - d.lfl));
  const [ux, uy] = px(d.ufl, 0.21 * (1 - d.ufl));
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" ` +
      `role="img" aria-label="${title}">`,
    `<defs><pattern id="hatch" width="6" height="6" patternUnits="userSpaceOnUse" ` +
      `patternTransform="rotate(45)"><line x1="0" y1="0" x2="0" y2="6" stroke="#000" stroke-width="1"/>` +
      `</pattern></defs>`,
    `<style>.grid{stroke:#bbb;stroke-width:0.5}.edge{fill:none;stroke:#000;stroke-width:1.5}` +
      `.zone{fill:url(#hatch);stroke:#000;stroke-width:1.2}.air{stroke:#000;stroke-width:1;` +
      `stroke-dasharray:6 3}.stoich{stroke:#000;stroke-width:1;stroke-dasharray:2 3}.path{fill:none;` +
      `stroke:#000;stroke-width:2}.state{fill:#fff;stroke:#000;stroke-width:1.5}.num{font:bold 13px ` +
      `sans-serif}.lab{font:12px sans-serif}.burn{stroke:#999;stroke-width:9;stroke-linecap:round}` +
      `.tick{font:10px sans-serif}</style>`,
    `<title>${title}</title>`,
    `${grid.join('')}`,
    `<polygon points="${pts(d.envelope)}" class="zone"/>`,
    `<polygon points="${tri}" class="edge"/>`,
    `<line x1="${f1(ax)}" y1="${f1(ay)}" x2="${f1(fx)}" y2="${f1(fy)}" class="air"/>`,
    `<line x1="${f1(ix)}" y1="${f1(iy)}" x2="${f1(sx)}" y2="${f1(sy)}" class="stoich"/>`,
    `<circle cx="${f1(lx)}" cy="${f1(ly)}" r="2.5"/><circle cx="${f1(ux)}" cy="${f1(uy)}" r="2.5"/>`,
    `${burn}${pathLine}${marks}` +
      `${
        d.flammable.length
          ? `\n<line x1="${f1(W - 150)}" y1="18" x2="${f1(W - 130)}" y2="18" class="burn"/><text ` +
            `x="${f1(W - 124)}" y="22" class="lab">flammable during a fill</text>`
          : ''
      }`,
    `${scale.join('')}`,
    `<text x="${f1(ix - 4)}" y="${f1(iy + 29)}" class="lab" text-anchor="start">inert (N2-eq.)</text>`,
    `<text x="${f1(M + SCALE + 4)}" y="${f1(iy + 29)}" class="lab" text-anchor="end">O2, %</text>`,
    `<text x="${f1(fx - 10)}" y="${f1(fy + 4)}" class="lab" text-anchor="end">fuel, %</text>`,
    `<text x="${f1(ax)}" y="${f1(ay + 15)}" class="lab" text-anchor="middle">air</text>`,
    `</svg>`,
  ].join('\n');
}

/**
 * Detail near the inert corner, where diluted kinetics mixtures sit: O2 fraction
 * across, fuel fraction up, both on the N2-equivalent basis, ranged to hold the fill
 * path and the nose of the flammable zone.
 */
export function detailRange(d: DiagramData): { oMax: number; fMax: number } {
  const loc = Math.min(...d.envelope.map(([, o]) => o));
  // states near the inert corner set the range; a pure first fill (far up the fuel axis) is left outside it
  const near = d.path.filter((p) => p.fuel <= Math.max(3 * d.lfl, 0.1) && p.oxygen <= 0.5);
  const last = d.path[d.path.length - 1];
  const pts = near.length ? near : [last];
  const oMax = Math.min(1, Math.max(0.05, 1.3 * Math.max(...pts.map((p) => p.oxygen)), 1.3 * loc));
  const fMax = Math.min(1, Math.max(0.02, 1.3 * Math.max(...pts.map((p) => p.fuel)), 1.5 * d.lfl));
  return { oMax, fMax };
}

function outside(d: DiagramData, oMax: number, fMax: number, right: number): string {
  const off = d.path.filter((p) => p.fuel > fMax || p.oxygen > oMax).map((p) => p.label);
  return off.length
    ? `<text x="${right}" y="${OUTSIDE_BASELINE}" class="lab" text-anchor="end">state ${off.join(', ')} ` +
        `outside this detail (see the triangle)</text>`
    : '';
}

/** the baseline of the "outside this detail" caption, and the frame's top when it is there (room for its descenders) */
const OUTSIDE_BASELINE = 13;
const TOP_WITH_CAPTION = 24;

export function detailSvg(d: DiagramData, title: string): string {
  const w = 440;
  const h = 300;
  const r = detailRange(d);
  // round ticks: the axes end on a whole step of 1, 2, 2.5 or 5 times a power of ten
  const oStep = niceStep(r.oMax);
  const fStep = niceStep(r.fMax);
  const oMax = Math.min(1, Math.ceil(r.oMax / oStep - 1e-9) * oStep);
  const fMax = Math.min(1, Math.ceil(r.fMax / fStep - 1e-9) * fStep);
  // a caption above the frame moves the frame down so they do not overlap; it ends where the frame ends
  const caption = outside(d, oMax, fMax, w - 14);
  const m = { l: 56, r: 14, t: caption ? TOP_WITH_CAPTION : 14, b: 40 };
  const X = (o: number) => m.l + (o / oMax) * (w - m.l - m.r);
  const Y = (f: number) => h - m.b - (f / fMax) * (h - m.t - m.b);
  const poly = d.envelope.map(([f, o]) => `${f1(X(o))},${f1(Y(f))}`).join(' ');
  const path = d.path.map((p) => [X(p.oxygen), Y(p.fuel)] as const);
  const spots = placeNumbers(
    d.path.map((p, i) => ({ label: p.label, x: path[i][0], y: path[i][1] })),
    [],
  );
  const ticks: string[] = [];
  for (let k = 0; k * oStep <= oMax + 1e-12; k++) {
    const o = k * oStep;
    ticks.push(
      `<line x1="${f1(X(o))}" y1="${h - m.b}" x2="${f1(X(o))}" y2="${h - m.b + 4}" ` +
        `class="edge"/><text x="${f1(X(o))}" y="${h - m.b + 16}" class="lab" text-anchor="middle">${pctTick(o)}</text>`,
    );
  }
  for (let k = 0; k * fStep <= fMax + 1e-12; k++) {
    const f = k * fStep;
    ticks.push(
      `<line x1="${m.l - 4}" y1="${f1(Y(f))}" x2="${m.l}" y2="${f1(Y(f))}" class="edge"/><text ` +
        `x="${m.l - 6}" y="${f1(Y(f) + 4)}" class="lab" text-anchor="end">${pctTick(f)}</text>`,
    );
  }
  const airTop = Math.min(fMax, 1 - oMax / 0.21);
  const air =
    oMax >= 0.2
      ? `<line x1="${f1(X(0.21))}" y1="${f1(Y(0))}" x2="${f1(X(0.21 * (1 - airTop)))}" ` +
        `y2="${f1(Y(airTop))}" class="air"/>`
      : '';
  const fs = Math.min(fMax, oMax / Math.max(d.z, 1e-9));
  const stoich = `<line x1="${f1(X(0))}" y1="${f1(Y(0))}" x2="${f1(X(d.z * fs))}" y2="${f1(Y(fs))}" class="stoich"/>`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${w} ${h}" width="${w}" height="${h}" ` +
      `role="img" aria-label="${title}">`,
    `<defs><clipPath id="plotarea"><rect x="${m.l}" y="${m.t}" width="${w - m.l - m.r}" height="` +
      `${h - m.t - m.b}"/></clipPath><pattern id="hatch2" width="6" height="6" ` +
      `patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><line x1="0" y1="0" x2="0" y2="6" ` +
      `stroke="#000" stroke-width="1"/></pattern></defs>`,
    `<style>.edge{fill:none;stroke:#000;stroke-width:1.2}.zone{fill:url(#hatch2);stroke:#000;` +
      `stroke-width:1.2}.air{stroke:#000;stroke-width:1;stroke-dasharray:6 3}.stoich{stroke:#000;` +
      `stroke-width:1;stroke-dasharray:2 3}.path{fill:none;stroke:#000;stroke-width:2}` +
      `.burn{stroke:#999;stroke-width:9;stroke-linecap:round}.state{fill:#fff;stroke:#000;` +
      `stroke-width:1.5}.num{font:bold 13px sans-serif}.lab{font:11px sans-serif}</style>`,
    `<title>${title}</title>`,
    `<g clip-path="url(#plotarea)"><polygon points="${poly}" class="zone"/>${air}${stoich}</g>`,
    `<rect x="${m.l}" y="${m.t}" width="${w - m.l - m.r}" height="${h - m.t - m.b}" class="edge"/>`,
    `<g clip-path="url(#plotarea)">` +
      `${d.flammable
        .map(
          (b) =>
            `<line x1="${f1(X(b.from.oxygen))}" y1="${f1(Y(b.from.fuel))}" x2="${f1(X(b.to.oxygen))}" ` +
            `y2="${f1(Y(b.to.fuel))}" class="burn"/>`,
        )
        .join('')}` +
      `${path.length > 1 ? `<polyline points="${path.map((p) => p.map(f1).join(',')).join(' ')}" class="path"/>` : ''}`,
    `${d.path.map((_, i) => stateMark(path[i][0], path[i][1], spots[i])).join('')}` + `</g>`,
    caption,
    `${ticks.join('')}`,
    `<text x="${f1((m.l + w - m.r) / 2)}" y="${h - 6}" class="lab" text-anchor="middle">O2, % ` +
      `(N2-equivalent basis)</text>`,
    `<text x="14" y="${f1((m.t + h - m.b) / 2)}" class="lab" text-anchor="middle" ` +
      `transform="rotate(-90 14 ${f1((m.t + h - m.b) / 2)})">fuel, %</text>`,
    `</svg>`,
  ].join('\n');
}
