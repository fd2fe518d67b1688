/**
 * The wording of the two-stage guided fill's refusals (`stage-fill`, `stage-order`): what, where,
 * why and what to do. Kept beside messages.ts, which spreads it in.
 */
import { TORR_PA } from './constants.js';
import type { StageFillCause, StageProblem } from './problems.js';

const torr = (pa: number) => `${Number((pa / TORR_PA).toPrecision(5))} Torr`;

function fillCause(c: StageFillCause): string {
  switch (c.kind) {
    case 'log-exists':
      if (c.closed)
        return (
          `the stage-${c.stage} log ${c.file} exists and is finished (closed): ` +
          (c.stage === 1
            ? 'the premix is made; fill the batch from it' +
              (c.next ? ` with \`${c.next}\`` : ' with fill --premix-log') +
              ', or give another --batch id to make a new premix'
            : 'this batch is filled; re-check it with `mixwright check`, or give another --batch id for a new one')
        );
      return (
        `the stage-${c.stage} log ${c.file} exists: a fill of this ${c.stage === 1 ? 'premix' : 'batch'} ` +
        `was started already, and a log is never overwritten; continue it with ` +
        `\`mixwright fill --resume ${c.file}\`, or give another --batch id for a new one`
      );
    case 'premix-low':
      return (
        `the premix tank ${c.tank}, filled to ${torr(c.startPa)} as planned, falls to ${torr(c.endPa)} ` +
        `once the batch has drawn its premix, but the batch's premix charge must reach ${torr(c.targetPa)} ` +
        `(${torr(c.requiredPa)} with the 10 % margin: gas flows only while the premix tank is higher); ` +
        "plan the premix to a higher pressure (recipe premix.pressure, within the tank's working limit) " +
        'or a smaller batch, before any gas flows'
      );
    case 'premix-changed':
      return (
        `the premix log ${c.file} ${c.found === null ? 'cannot be read' : 'has changed'} since this batch ` +
        `was started from it (sha256 ${c.expected.slice(0, 12)}..., now ` +
        `${c.found === null ? 'none' : `${c.found.slice(0, 12)}...`}): the batch's targets rest on the ` +
        `premix as it was logged then; restore that log, or start a new batch from the premix log as it is`
      );
  }
}

/** the wording of a two-stage fill refusal */
export function describeStageProblem(p: StageProblem): string {
  if (p.code === 'stage-order')
    return (
      `a fill order (${p.order}) is not taken together with a premix tank (${p.premixTank}): the ` +
      `two-stage plan chooses the batch's order around the premix it makes, and would otherwise ` +
      `ignore the order given; leave out the order (the plan shows the order it chose), or plan ` +
      `one tank with the order`
    );
  return fillCause(p.cause);
}
