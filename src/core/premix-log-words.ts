/**
 * The wording of a refused premix log: what is wrong with the log named as the batch's premix
 * source, why it cannot be used, and what to do. Spread into messages.ts.
 */
import { TORR_PA } from './constants.js';
import type { Problem } from './problems.js';

const torr = (pa: number) => `${Number((pa / TORR_PA).toPrecision(5))} Torr`;

/** why the premix log cannot be used */
export function describePremixLogProblem(
  p: Extract<Problem, { code: 'premix-log-refused' }>,
  describe: (q: Problem) => string,
): string {
  const c = p.cause;
  const at = `premix log ${p.log}`;
  switch (c.kind) {
    case 'unreadable':
      return (
        `${at} cannot be read as a batch log: ${describe(c.problem)}; ` +
        'name the finished batch log of the premix tank'
      );
    case 'drawn-early':
      return (
        `${at} drew from its own premix before that premix's least mixing time (confirmed as mixed ` +
        'early): its re-check assumes a uniform premix, which its record does not show, so it is no ' +
        'pass and cannot be a source; make it again and wait out the mixing time before drawing'
      );
    case 'not-finished':
      return (
        `${at} is not a finished fill (${[
          c.missingSteps.length ? `no reading for step ${c.missingSteps.join(', ')}` : '',
          c.closed ? '' : 'not closed',
        ]
          .filter(Boolean)
          .join(', ')}): the premix's composition is not known until every fill is logged and ` +
        'the log is closed; finish or close that fill first'
      );
    case 'recheck-not-passed':
      return (
        `${at} ` +
        (c.verdict === 'fail'
          ? 'fails its re-check'
          : 'cannot be shown within its tolerance by its re-check') +
        (c.off.length ? ` (${c.off.join(', ')})` : '') +
        ': a batch filled from it would rest on a premix whose composition is not proven; run ' +
        '`mixwright check` on it, and make a new premix if the readings are right'
      );
    case 'danger':
      return (
        `${at} records a danger (${c.codes.join(', ')}): the premix tank must not be used until it ` +
        'and its gauges have been inspected; see `mixwright check` on that log'
      );
    case 'too-little-gas':
      return (
        `the premix tank ${c.tank} of ${at} holds ${torr(c.startPa)} now and ` +
        `${c.endPa > 0 ? `would fall to ${torr(c.endPa)}` : 'would run empty'} after delivering ` +
        `${c.deliveredMol.toPrecision(3)} mol, but the batch reading its last charge must reach is ` +
        `${torr(c.targetPa)} (gas flows only while the premix tank is higher; ${torr(c.requiredPa)} ` +
        'leaves a 10 % margin): make a new premix, or plan a smaller batch or a lower final pressure'
      );
    case 'foreign-gas':
      return (
        `${at} holds ${c.species.join(', ')}, which the design (${c.design.join(', ')}) does not: ` +
        "it is not a premix of this design's gases; name the premix log of this design's gases"
      );
    case 'same-tank':
      return (
        `${at} is of the batch tank ${c.tank} itself: a premix must be in another tank; ` +
        'to top up the gas in the batch tank, give it as in_tank in the recipe'
      );
    case 'not-in-order':
      return (
        `the fill order does not name the premix ${c.source} of ${at}: name it in the order ` +
        `(e.g. --order "CH4,Ar,${c.source},Ar"), or leave the order out to let the plan choose`
      );
    case 'changed':
      return (
        `${at} has changed since the batch log recorded it (its last entry was ${c.recorded.slice(0, 12)}..., ` +
        `now ${c.now.slice(0, 12)}...): the batch's premix may not be the gas that log now describes; ` +
        'restore the premix log as it was when the batch was filled'
      );
    case 'loop':
      return (
        `${at} names, through its own premix logs, the log that names it: a premix cannot be made ` +
        'from itself; correct the premix_logs of those logs'
      );
    case 'with-premix-tank':
      return (
        `a premix to make and an existing premix log are both asked for (${c.places[0]} and ` +
        `${c.places[1]}): give the premix block either a tank to make the premix in (with its ` +
        'gases, fraction, pressure, order) or the log of a premix tank that exists'
      );
    case 'record-altered':
      return (
        `${at} was changed after it was written: ${c.lines.length === 1 ? 'line' : 'lines'} ` +
        `${c.lines.join(', ')} ${c.lines.length === 1 ? 'does' : 'do'} not match the log's hash chain ` +
        '(see `mixwright check` on it), so the composition it gives is not the one the premix was filled ' +
        'to; restore the log as it was written (a backup), or re-measure the premix tank or make a new premix'
      );
    case 'not-drawn':
      return (
        `${at} was given, but no row of ${c.file} draws from that premix: the rows name ` +
        `${c.rows.join(', ')}, none of them ${c.names.join(' or ')}, so its composition and budget would ` +
        'not be used and the re-check would not be of a batch filled from it. If a charge came from that ' +
        `premix tank, name it so in its row (${c.names.join(' or ')}); if none did, leave --premix-log out`
      );
    case 'not-the-premix':
      // a log that is no premix is not called one
      return describeNotThePremix(c.given.is === 'premix' ? at : `${p.log} (given as the premix log)`, c);
    case 'not-a-pass':
      return describeNotAPass(at, c);
  }
}

/** a premix log whose record stands against a pass (check's outcome): what, why, what to do */
function describeNotAPass(
  at: string,
  c: Extract<Extract<Problem, { code: 'premix-log-refused' }>['cause'], { kind: 'not-a-pass' }>,
): string {
  const list = c.hazards.map((h) => `${h.code}${h.step !== null ? ` (fill ${h.step})` : ''}`).join(', ');
  const one = c.hazards.length === 1;
  const what =
    c.outcome === 'plan-danger-not-acknowledged'
      ? `PLAN DANGER NOT ACKNOWLEDGED: the safety review of the plan that log records found ${list} ` +
        `(${one ? 'a danger' : 'dangers'}) and the log records no acknowledgement of ${one ? 'it' : 'them'}`
      : c.outcome === 'recorded-fill-danger'
        ? `DANGER IN THE RECORDED FILL: the safety review of the fill as that log records it finds ${list} ` +
          `(${one ? 'a danger' : 'dangers'}), not shown accepted`
        : `ACCEPTED HAZARD: the fill that log records went on through ${list}` +
          `${c.by?.length ? `, accepted by ${c.by.join(', ')}` : ''} at the manifold`;
  return (
    `${at} is not a pass (${what}): its composition may be within tolerance, but its record says the ` +
    'tank it records went through states reviewed as dangerous, and `mixwright check` of that log gives ' +
    'no pass (exit 6); a batch is filled only from a premix whose re-check is a pass. Have that fill and ' +
    'its tank reviewed under local practice (see `mixwright check` on that log), then make a new premix ' +
    '(plan it again: its plan says how to fill without the hazard), or fill the batch in one tank'
  );
}

/** the --premix-log given is not the log of the premix a CSV row names: what it is, what is needed, what to do */
function describeNotThePremix(
  at: string,
  c: Extract<Extract<Problem, { code: 'premix-log-refused' }>['cause'], { kind: 'not-the-premix' }>,
): string {
  const g = c.given;
  const stage = g.batch !== undefined ? ` of batch ${g.batch}` : '';
  const is =
    g.is === 'premix'
      ? `the log of the premix filled in tank ${g.tank} (stage 1${stage})`
      : g.is === 'from-premix'
        ? `the log of batch ${g.id}, filled in tank ${g.tank} from a premix (stage 2${stage}): a ` +
          'batch, not a premix'
        : `the log of ${g.id}, a single-tank fill in tank ${g.tank} (its header records no stage)`;
  const tank = c.row.tank;
  const needed =
    tank === undefined
      ? `${c.row.file} line ${c.row.line} names ${c.row.name}, a premix fill by its gases, so --premix-log ` +
        `must be the log of the premix that gas came from (its stage-1 log)`
      : `${c.row.file} line ${c.row.line} names ${c.row.name}, the premix filled in tank ${tank}` +
        (c.row.tankKnown ? '' : ` (the lab profile lists no tank ${tank}: check the name)`) +
        `, so --premix-log must be the log of that premix (the stage-1 log of tank ${tank})`;
  const todo = g.premixLog
    ? `give --premix-log ${g.premixLog}, the premix log that batch was filled from (the batch log records it)`
    : `give the stage-1 log of ${tank === undefined ? 'the premix tank' : `tank ${tank}`} (the guided fill ` +
      `wrote it as batches/<batch>-premix.jsonl)` +
      (g.is === 'premix' && tank !== undefined
        ? `, or, if the gas of that row came from tank ${g.tank}, name it premix-${g.tank}`
        : '');
  return `${at} is ${is}; ${needed} - ${todo}`;
}
