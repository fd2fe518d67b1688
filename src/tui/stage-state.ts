/**
 * What the end screen of a two-stage fill adds (pure, tested alone): for stage 1 the premix's
 * re-checked composition +- U (from the logged readings by `check`'s model, never the design), its
 * mixing time at the logged final pressure, and the exact command of stage 2; for stage 2 the
 * premix log the batch was filled from.
 */
import { mixingEstimate } from '../core/index.js';
import type { LogHeader } from '../io/batch-log.js';
import type { CheckReport } from '../io/check.js';
import { overallVerdict } from '../report/check-outcome.js';
import { fixedSig } from '../report/format.js';
import { withU } from '../report/label-model.js';
import { duration } from '../report/ready-report.js';

const pct = (x: number) => `${Number((x * 100).toPrecision(2))} %`;

/** the premix's re-checked fractions, largest first: "x(Ar) 86.58 % +- 0.26 % (U 0.040 % of the value)" */
function fractionLines(report: CheckReport): string[] {
  const r = report.result;
  return [...r.species]
    .map((k) => ({ k, st: r.composition[k] }))
    .filter((e) => e.st && e.st.value >= 1e-4)
    .sort((a, b) => b.st.value - a.st.value)
    .map(({ k, st }) => {
      const U = 2 * st.u;
      // a U that was not computed is not given as a share of the value
      const share = U > 0 && Number.isFinite(U) ? `  (U ${pct(U / st.value)} of the value)` : '';
      return `  x(${k}) ${withU(st.value * 100, U * 100, '%')}${share}`;
    });
}

function mixingLines(header: LogHeader, report: CheckReport): string[] {
  const t = header.stage?.premix_tank;
  const last = report.readings[report.readings.length - 1];
  if (!t || !last)
    return ['Mixing: the lab profile gives no height for the premix tank; see `mixwright ready`'];
  const y = Object.fromEntries(report.result.species.map((k) => [k, report.result.composition[k].value]));
  const m = mixingEstimate(y, last.temperatureK, last.pressurePa, t.height_m, t.stirred);
  const out: string[] = [];
  if (m.to1PercentS !== undefined && m.to01PercentS !== undefined)
    out.push(
      `Mixing: by diffusion alone over ${fixedSig(t.height_m * 100, 3)} cm, ${duration(m.to1PercentS)} ` +
        `to 1 %, ${duration(m.to01PercentS)} to 0.1 % residual non-uniformity` +
        (m.pair ? ` (slowest pair ${m.pair.a}-${m.pair.b})` : ''),
    );
  else out.push('Mixing: no diffusion data for this premix; see `mixwright ready`');
  out.push(
    t.stirred
      ? '  the premix tank is stirred: run the stirrer (common practice: 15-30 min) before stage 2'
      : '  not stirred: wait at least the 0.1 % time before stage 2 draws from it',
  );
  return out;
}

/** the lines the end screen adds for a stage log; none for a single-tank batch */
export function stageEndLines(header: LogHeader, report: CheckReport | undefined, closed: boolean): string[] {
  const st = header.stage;
  if (!st) return [];
  if (st.number === 2)
    return [
      `Stage 2 of 2 - batch ${st.batch}, filled from the premix log ${st.premix_log?.file ?? '(not named)'}` +
        ' (its re-checked composition is the premix source of this batch)',
    ];
  const out = [`Stage 1 of 2 - the premix for batch ${st.batch}`];
  if (!report) return [...out, 'The premix is re-checked from its readings when the fill ends.'];
  out.push("Premix as filled (re-checked from the logged readings by check's model, U at k = 2):");
  out.push(...fractionLines(report));
  // check's own overall outcome (the function premix-check.ts refuses a premix log by)
  const outcome = overallVerdict(report);
  if (!closed || outcome !== 'pass') {
    // an unusable premix is not worth mixing: say what to do instead
    out.push(
      `Stage 2 will refuse this premix log: its re-check is not a pass (${closed ? outcome : 'not-closed'}; ` +
        'stage 2 takes only a premix whose re-check is a pass: closed, within tolerance, no danger in ' +
        'its record, no hazard gone through; `mixwright check` says what stands against it). Do not mix ' +
        'it for stage 2: vent or evacuate the premix tank and fill a new premix batch (a new --batch ' +
        'id), after `mixwright check` of this log has said what went wrong.',
    );
    return out;
  }
  out.push(...mixingLines(header, report));
  out.push('Next, stage 2 (the batch from this premix), once it is mixed:');
  out.push(`  ${st.next_command ?? '(no command recorded)'}`);
  return out;
}

/**
 * what a fill screen's title adds for a stage log: which stage, and which tank it fills (stage 1 the
 * premix tank, stage 2 the batch's tank); empty for a single-tank batch
 */
export function stageTag(header: Pick<LogHeader, 'stage' | 'tank'>): string {
  const st = header.stage;
  if (!st) return '';
  return st.number === 1
    ? ` (stage 1 of 2: premix tank ${header.tank.id})`
    : ` (stage 2 of 2: batch tank ${header.tank.id})`;
}

/** the title of every fill screen: the batch id, and for a stage log its stage and tank */
export function fillTitle(header: Pick<LogHeader, 'id' | 'stage' | 'tank'>): string {
  return `mixwright fill ${header.id}${stageTag(header)}`;
}

/** where the gas goes, on the reading screen: the premix tank of stage 1, the batch tank of stage 2 */
export function intoTank(header: Pick<LogHeader, 'stage' | 'tank'>): string {
  const st = header.stage;
  if (!st) return '';
  return st.number === 1
    ? ` into premix tank ${header.tank.id} (the premix for batch ${st.batch})`
    : ` into ${header.tank.id} (batch ${st.batch})`;
}
