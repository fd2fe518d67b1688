/** Renderers of a re-check: text for the terminal, JSON with SI keys, and the folder summary. */
import { fixedSig, padTable } from './format.js';
import { fromPa, isPressureUnit } from '../io/quantity.js';
import type { CheckReport } from '../io/check.js';
import type { OutputStat } from '../core/index.js';

const VERDICT_TEXT: Record<string, string> = {
  pass: 'PASS - every design fraction is within its tolerance, uncertainty included',
  'pass-uncertain': 'PASS (not proven) - every design fraction is within its tolerance, but the 95 % uncertainty reaches past it for some',
  fail: 'FAIL - out of tolerance',
  'no-design': 'no design to compare with',
};

function mcNote(st: OutputStat): string {
  if (!st.mc) return '';
  if (st.mc.validated) return 'agrees';
  const inside = st.mc.low >= st.low && st.mc.high <= st.high;
  return inside ? 'narrower' : 'DIFFERS';
}

export function checkToText(r: CheckReport): string {
  const out: string[] = [];
  out.push(`Re-check  ${r.id}   (${r.kind === 'log' ? 'batch log' : 'CSV readings'} ${r.file})`);
  out.push('');
  const readRows: string[][] = [['#', 'fill', 'gauge', 'absolute pressure', 'T degC']];
  for (const x of r.readings) {
    const u = isPressureUnit(x.gauge.unit) ? x.gauge.unit : 'Pa';
    readRows.push([String(x.step), x.source.id, x.gauge.id, `${fixedSig(fromPa(x.pressurePa, u), 7)} ${u}`, (x.temperatureK - 273.15).toFixed(2)]);
  }
  out.push(...padTable(readRows, [true, false, false, true, true]));
  out.push('');
  const rows: string[][] = [['species', 'actual x', 'u (GUM)', '95 % interval (GUM, k=2)', 'u (MC)', 'MC vs GUM', 'design', 'deviation', 'tolerance', '']];
  const dev = new Map(r.verdict.deviations.map((d) => [d.species, d]));
  const order = Object.entries(r.result.composition).sort((a, b) => b[1].value - a[1].value);
  for (const [k, st] of order) {
    const d = dev.get(k);
    rows.push([
      k,
      fixedSig(st.value, 6),
      fixedSig(st.u, 2),
      `${fixedSig(st.low, 6)} - ${fixedSig(st.high, 6)}`,
      st.mc ? fixedSig(st.mc.u, 2) : '-',
      mcNote(st),
      d ? fixedSig(d.design, 6) : '-',
      d ? fixedSig(d.deviation, 2) : '-',
      d ? `+-${fixedSig(d.tolerance, 2)}` : '-',
      d ? (d.provenWithin ? 'ok' : d.within ? 'ok?' : 'OUT') : '',
    ]);
  }
  out.push(...padTable(rows, [false, true, true, true, true, false, true, true, true, false]));
  out.push('');
  if (r.result.phi) out.push(`phi         ${r.result.phi.value.toFixed(5)}  u ${fixedSig(r.result.phi.u, 2)}  95 %: ${r.result.phi.low.toFixed(5)} - ${r.result.phi.high.toFixed(5)}${r.design?.phi !== undefined ? `  (design ${r.design.phi.toFixed(4)})` : ''}`);
  if (r.result.diluentFraction) out.push(`diluent     ${fixedSig(r.result.diluentFraction.value, 6)}  u ${fixedSig(r.result.diluentFraction.u, 2)}${r.design ? `  (design ${fixedSig(r.design.diluentFraction, 6)})` : ''}`);
  if (r.result.unidentified > 0) out.push(`unidentified cylinder impurity: ${fixedSig(r.result.unidentified * 1e6, 3)} ppm (not included in the fractions above)`);
  const fuel = order.find(([k]) => (r.design?.composition[k] ?? 0) > 0 && k !== 'O2' && !(r.design && k in r.design.groups.diluent));
  if (fuel) {
    out.push('');
    out.push(`Largest contributions to u(${fuel[0]}):`);
    for (const b of fuel[1].budget) out.push(`  ${b.name.padEnd(36)} ${fixedSig(b.contribution, 2)}`);
  }
  out.push('');
  out.push(
    r.result.trials > 0
      ? `Monte Carlo: ${r.result.trials} trials, seed ${r.result.seed} (JCGM 101; "agrees": the GUM interval is validated to within its numerical tolerance; "narrower": the Monte Carlo interval lies inside the GUM one)`
      : 'GUM law of propagation only (no Monte Carlo run; give --trials 200000 for one)',
  );
  for (const w of r.warnings) out.push(`warning: ${w}`);
  out.push('');
  out.push(`Verdict     ${r.incomplete.length ? `INCOMPLETE - no reading for ${r.incomplete.join(', ')}: the batch is not finished, so it is not passed; the fractions above cover the fills logged so far` : VERDICT_TEXT[r.verdict.verdict]}`);
  return out.join('\n') + '\n';
}

function statJson(st: OutputStat) {
  return {
    value: st.value,
    u: st.u,
    interval95: [st.low, st.high],
    mc: st.mc ? { mean: st.mc.mean, u: st.mc.u, interval95: [st.mc.low, st.mc.high], validated: st.mc.validated, tolerance: st.mc.tolerance } : null,
    budget: st.budget,
  };
}

export function checkToJson(r: CheckReport, version: string): object {
  const composition: Record<string, object> = {};
  for (const [k, st] of Object.entries(r.result.composition)) composition[k] = statJson(st);
  return {
    tool: 'mixwright',
    version,
    kind: 'check',
    id: r.id,
    file: r.file,
    source: r.kind,
    composition,
    phi: r.result.phi ? statJson(r.result.phi) : null,
    dilution: r.result.diluentFraction ? statJson(r.result.diluentFraction) : null,
    unidentified_fraction: r.result.unidentified,
    readings: r.readings.map((x) => ({ step: x.step, source: x.source.id, gauge: x.gauge.id, pressure_Pa: x.pressurePa, temperature_K: x.temperatureK })),
    design: r.design ? { composition: r.design.composition, phi: r.design.phi ?? null } : null,
    tolerance: r.tolerance,
    deviations: r.verdict.deviations,
    verdict: r.verdict.verdict,
    incomplete: r.incomplete,
    warnings: r.warnings,
    trials: r.result.trials,
    seed: r.result.seed,
  };
}

export function folderSummary(rows: readonly ({ file: string } & ({ report: CheckReport } | { error: string }))[]): string {
  const table: string[][] = [['file', 'batch', 'verdict', 'phi', 'worst |dev|/tol']];
  for (const r of rows) {
    if ('error' in r) {
      table.push([r.file, '-', 'ERROR', '-', r.error]);
      continue;
    }
    const rep = r.report;
    const worst = rep.verdict.deviations.reduce((m, d) => Math.max(m, Math.abs(d.deviation) / d.tolerance), 0);
    table.push([r.file, rep.id, rep.incomplete.length ? 'incomplete' : rep.verdict.verdict, rep.result.phi ? rep.result.phi.value.toFixed(4) : '-', rep.verdict.deviations.length ? worst.toFixed(2) : '-']);
  }
  return padTable(table, [false, false, false, true, true]).join('\n') + '\n';
}
