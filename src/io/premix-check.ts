/**
 * A premix made earlier, named by its batch log, as a source of the batch: its composition is the
 * log's re-checked composition (GUM, the same model and inputs as `check`: check.ts
 * `logRecheckBasis`) and its uncertainty that re-check's budget, carried into the batch's budget as
 * composition terms (core plan/premix-source.ts), a gauge or thermometer of the same lab marked as
 * shared with the batch. Refused (`premix-log-refused`) when the log cannot serve: unreadable, or
 * whatever `check` of it would not call a pass, by check's own overall outcome (report/check-outcome.ts
 * `checkOutcomes` on the parts `checkLog` uses): not a finished fill, a re-check that fails or cannot
 * show its composition within its tolerance, a danger in its record, an altered record, a plan danger
 * nobody acknowledged, a danger in the fill as recorded, hazards accepted at the manifold. A batch
 * log names its premix logs in its header (`premix_logs`: path
 * relative to the batch log, the hash of the premix log's last entry); `premixLogsOf` reads them
 * back for `check` and refuses a premix log that has changed since.
 */
import { readdirSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import {
  amountDrawn,
  evaluateUncertainty,
  fail,
  premixSource,
  ProblemError,
  type GasSource,
  type PremixLogCause,
  type TankSpec,
  type UncertaintyResult,
} from '../core/index.js';
import { readLog, type LogHeader, type ParsedLog } from './batch-log.js';
import { alteredLinesOf, logRecheckBasis, logVerdict } from './log-recheck.js';
import { auditLog, type LogFinding } from './log-audit.js';
import type { CheckReport } from './check-shared.js';
import { logRecordOutcome } from './check-recorded.js';
import { checkOutcomes, type CheckOutcome } from '../report/check-outcome.js';
import type { AcceptedHazard, PlanDanger } from '../report/check-types.js';

/** a premix log re-checked for use as a source */
export interface PremixRecord {
  /** as named (recipe, option or batch log header) */
  readonly named: string;
  /** absolute path */
  readonly path: string;
  readonly log: ParsedLog;
  readonly source: GasSource;
  readonly result: UncertaintyResult;
  readonly lastEntrySha256: string;
  readonly lastReadingPa: number;
  readonly tank: TankSpec;
}

/** the source id of a premix in a tank: the two-stage plan's label (`premix-MT-2`) */
export const PREMIX_ID_PREFIX = 'premix-';
export const premixIdOf = (tankId: string): string => `${PREMIX_ID_PREFIX}${tankId}`;

function refused(named: string, cause: PremixLogCause, where: { file?: string; field?: string } = {}): never {
  return fail({ code: 'premix-log-refused', log: named, cause }, where);
}

/** the tank of a log's header as the planner takes it */
function tankOf(h: LogHeader): TankSpec {
  const rated = h.tank.rated_pressure_Pa ?? undefined;
  const limit = h.tank.working_limit_Pa ?? undefined;
  return {
    id: h.tank.id,
    label: h.tank.id,
    volumeM3: h.tank.volume_m3,
    ratedPressurePa: rated,
    workingFraction: rated !== undefined && limit !== undefined ? limit / rated : undefined,
  };
}

/** the parts of a premix log's re-check that name what stands against a pass */
interface OutcomeParts {
  readonly missingSteps: readonly number[];
  readonly closed: boolean;
  readonly verdict: ReturnType<typeof logVerdict>;
  readonly findings: readonly LogFinding[];
  readonly altered: readonly number[];
  readonly accepted: readonly AcceptedHazard[];
  readonly unacknowledged: readonly PlanDanger[];
  readonly recorded: { readonly dangers: readonly PlanDanger[] };
}

/** why a premix log whose re-check is not a pass is refused: check's first outcome, in its own terms */
function refusalOf(outcome: CheckOutcome, p: OutcomeParts): PremixLogCause {
  const off = () => p.verdict.deviations.filter((d) => !d.provenWithin).map((d) => d.species);
  switch (outcome) {
    case 'incomplete':
    case 'not-closed':
      return { kind: 'not-finished', missingSteps: p.missingSteps, closed: p.closed };
    case 'fail':
      return { kind: 'recheck-not-passed', verdict: 'fail', off: off() };
    case 'not-shown-within-tolerance':
    case 'no-design':
      // a log always carries its design: no-design cannot come from a log, and is no pass either
      return { kind: 'recheck-not-passed', verdict: 'pass-uncertain', off: off() };
    case 'danger':
      return {
        kind: 'danger',
        codes: [...new Set(p.findings.filter((f) => f.severity === 'danger').map((f) => f.code))],
      };
    case 'plan-danger-not-acknowledged':
      return { kind: 'not-a-pass', outcome, hazards: p.unacknowledged };
    case 'recorded-fill-danger':
      return { kind: 'not-a-pass', outcome, hazards: p.recorded.dangers };
    case 'accepted-hazard':
      return {
        kind: 'not-a-pass',
        outcome,
        hazards: p.accepted.flatMap((a) => a.hazards.map((z) => ({ code: z.code, step: z.step ?? a.step }))),
        by: [...new Set(p.accepted.map((a) => `${a.by} at ${a.time}`))],
      };
    case 'record-altered':
      return { kind: 'record-altered', lines: p.altered };
    case 'premix-drawn-early':
      return { kind: 'drawn-early' };
  }
}

/**
 * Read and re-check a premix log. `batchLab`: the lab the batch is filled in; the premix's gauges
 * and thermometer are the batch's own (one input for both stages) only when the labs are the same.
 * `seen`: the premix logs above this one (a premix made from a premix), to refuse a loop.
 */
export function readPremixLog(
  named: string,
  path: string,
  batchLab: string | undefined,
  seen: ReadonlySet<string> = new Set(),
): PremixRecord {
  let log: ParsedLog;
  try {
    log = readLog(path);
  } catch (e) {
    if (e instanceof ProblemError) refused(named, { kind: 'unreadable', problem: e.problem }, e.where);
    throw e;
  }
  const h = log.header;
  const altered = alteredLinesOf(log);
  const done = new Set(log.readings.map((r) => r.step));
  const missingSteps = h.steps.map((s) => s.step).filter((s) => !done.has(s));
  const notFinished = () =>
    refused(named, { kind: 'not-finished', missingSteps, closed: log.closed }, { file: path });
  if (log.readings.length === 0) notFinished();
  let basis: ReturnType<typeof logRecheckBasis<PremixRecord>>;
  let result: UncertaintyResult;
  try {
    basis = logRecheckBasis(log, () => premixLogsOf(log, new Set([...seen, path])));
    const m = basis.model;
    result = evaluateUncertainty(m.readings, m.settings, m.diluent, m.initial);
  } catch (e) {
    if (!(e instanceof ProblemError) || e.problem.code === 'premix-log-refused') throw e;
    // numbers that cannot be re-checked: an altered or unfinished record says why first
    if (altered.length) refused(named, { kind: 'record-altered', lines: altered }, { file: path });
    if (missingSteps.length || !log.closed) notFinished();
    throw e.at({ file: path });
  }
  // check's own overall outcome of this log (the same function, on the same parts): a premix is a source
  // only when `check` of its log is a pass
  const verdict = logVerdict(log, result, basis.missingSteps);
  const findings = auditLog(log);
  const record = logRecordOutcome(log, basis.model);
  const outcome = checkOutcomes({
    verdict,
    incomplete: missingSteps.map((s) => `step ${s}`),
    findings,
    record: { alteredLines: altered, closed: log.closed, acceptedHazards: record.accepted },
    planDangersNotAcknowledged: record.unacknowledged,
    recordedFillDangers: record.recorded.dangers,
  })[0];
  if (outcome !== undefined)
    refused(
      named,
      refusalOf(outcome, {
        missingSteps,
        closed: log.closed,
        verdict,
        findings,
        altered,
        ...record,
      }),
      { file: path },
    );
  const composition = Object.fromEntries(result.species.map((k) => [k, result.composition[k].value]));
  const last = log.readings[log.readings.length - 1];
  const tank = tankOf(h);
  const source = premixSource({
    id: premixIdOf(tank.id),
    tank: tank.id,
    gases: Object.keys(h.design.composition).filter((k) => (h.design.composition[k] ?? 0) > 0),
    composition,
    unidentified: result.unidentified,
    pressurePa: last.pressure_Pa,
    budget: result,
    sharedInstruments: batchLab === undefined || batchLab === h.lab,
  });
  return {
    named,
    path,
    log,
    source,
    result,
    lastEntrySha256: log.lastLink,
    lastReadingPa: last.pressure_Pa,
    tank,
  };
}

/**
 * CSV readings: refuse a --premix-log that is not the log of the premix a row names by its source id
 * (`premix-MT-2`), before it is re-checked, so that the refusal says what was given (another tank's
 * premix, a single-tank batch, a batch filled from a premix) and what was expected, not a re-check
 * of the wrong log. A log that cannot be read is left to `readPremixLog`, which says so.
 */
export function refuseNotThePremix(
  named: string,
  path: string,
  rows: readonly { readonly name: string; readonly line: number }[],
  at: {
    /** the readings file */
    readonly file: string;
    /** the lab profile's tanks */
    readonly tanks: readonly string[];
    /** the gases of the design the readings were filled to (--recipe), when known */
    readonly design?: readonly string[];
  },
): void {
  const { design } = at;
  // a row naming a premix by its tank (premix-MT-2), or a premix fill by its gases (Ar+O2)
  const byGases = (name: string) => !name.startsWith(PREMIX_ID_PREFIX) && name.includes('+');
  const premixRows = rows.filter((r) => r.name.startsWith(PREMIX_ID_PREFIX) || byGases(r.name));
  if (!premixRows.length) return;
  let log: ParsedLog;
  try {
    log = readLog(path);
  } catch (e) {
    if (e instanceof ProblemError) return;
    throw e;
  }
  const h = log.header;
  // the gases the log was filled to (its own design): one the batch's design has not is another mixture
  const foreign = design
    ? Object.keys(h.design.composition).filter((k) => h.design.composition[k] > 0 && !design.includes(k))
    : [];
  const fromPremix = h.stage?.number === 2 || (h.premix_logs?.length ?? 0) > 0;
  // the gases a log was filled to, as a row names them (an older premix log records no stage)
  const gases = Object.keys(h.design.composition)
    .filter((k) => h.design.composition[k] > 0)
    .sort()
    .join('+');
  const sameGases = (name: string) => name.split('+').sort().join('+') === gases;
  const row = premixRows.find((r) =>
    byGases(r.name)
      ? fromPremix || (h.stage?.number !== 1 && !sameGases(r.name))
      : fromPremix || r.name !== premixIdOf(h.tank.id),
  );
  if (!row) {
    if (foreign.length && design)
      refused(named, { kind: 'foreign-gas', species: foreign, design }, { field: '--premix-log' });
    return;
  }
  // a batch filled from the premix the row names: the premix log it names, as a path to give
  const logs = namedPremixLogs(log);
  const entry = byGases(row.name)
    ? logs.length === 1
      ? logs[0]
      : undefined
    : logs.find((n) => n.entry.source === row.name);
  const tank = byGases(row.name) ? undefined : row.name.slice(PREMIX_ID_PREFIX.length);
  const rel = entry ? relative(process.cwd(), entry.path) : undefined;
  refused(
    named,
    {
      kind: 'not-the-premix',
      row: {
        name: row.name,
        file: at.file,
        line: row.line,
        ...(tank === undefined ? {} : { tank }),
        tankKnown: tank === undefined || at.tanks.includes(tank),
      },
      given: {
        id: h.id,
        tank: h.tank.id,
        is: fromPremix ? 'from-premix' : h.stage?.number === 1 ? 'premix' : 'single',
        ...(h.stage ? { batch: h.stage.batch } : {}),
        ...(entry ? { premixLog: rel && !rel.startsWith('..') ? rel : entry.path } : {}),
      },
    },
    { field: '--premix-log' },
  );
}

/** the premix logs a batch log's header names, resolved against the batch log's folder */
function namedPremixLogs(
  log: ParsedLog,
): { entry: NonNullable<LogHeader['premix_logs']>[number]; path: string }[] {
  return (log.header.premix_logs ?? []).map((entry) => ({
    entry,
    path: resolve(dirname(log.file), entry.path),
  }));
}

/**
 * The premix sources a batch log names (header `premix_logs`), each re-checked from its log: the
 * source ids mapped to them, and the records. Refused when a premix log is missing or unreadable,
 * has changed since the batch log recorded it (the hash of its last entry differs), or names this
 * log again (a loop).
 */
export function premixLogsOf(
  log: ParsedLog,
  seen: ReadonlySet<string> = new Set([resolve(log.file)]),
): { sources: Map<string, GasSource>; records: PremixRecord[] } {
  const sources = new Map<string, GasSource>();
  const records: PremixRecord[] = [];
  for (const { entry, path } of namedPremixLogs(log)) {
    const where = { file: log.file, field: 'premix_logs' };
    if (seen.has(path)) refused(entry.path, { kind: 'loop' }, where);
    let rec: PremixRecord;
    try {
      rec = readPremixLog(entry.path, path, log.header.lab, seen);
    } catch (e) {
      // a refusal of the premix log names that log in its words: its place is this header's field
      // (never the premix log's path beside a field of the batch log)
      if (e instanceof ProblemError && e.problem.code === 'premix-log-refused')
        throw new ProblemError(e.problem, where);
      if (e instanceof ProblemError) throw e.at(where);
      throw e;
    }
    if (rec.lastEntrySha256 !== entry.last_entry_sha256)
      refused(
        entry.path,
        { kind: 'changed', recorded: entry.last_entry_sha256, now: rec.lastEntrySha256 },
        where,
      );
    sources.set(entry.source, { ...rec.source, id: entry.source });
    records.push(rec);
  }
  return { sources, records };
}

/**
 * What other batch logs in the premix log's folder that name it have drawn from the premix tank:
 * for each, the real-gas amount its premix fills delivered (its readings in force, the re-check's
 * inverse model: the tank's density after each reading times its volume). `except`: the batch log
 * being planned or checked itself.
 */
export function drawsFrom(premixPath: string, except?: string): { log: string; file: string; mol: number }[] {
  const folder = dirname(premixPath);
  let names: string[];
  try {
    names = readdirSync(folder)
      .filter((n) => n.endsWith('.jsonl'))
      .sort();
  } catch {
    return [];
  }
  const out: { log: string; file: string; mol: number }[] = [];
  for (const name of names) {
    const file = join(folder, name);
    if (file === premixPath || (except !== undefined && resolve(except) === file)) continue;
    let log: ParsedLog;
    try {
      log = readLog(file);
    } catch {
      continue; // not a batch log (or unreadable): it names no premix log that could be read
    }
    const named = namedPremixLogs(log).filter((n) => n.path === premixPath);
    if (!named.length || log.readings.length === 0) continue;
    // the amounts drawn need the batch's readings only, not its premix re-checked
    const basis = logRecheckBasis(log);
    let mol = 0;
    for (const n of named)
      mol += amountDrawn(
        basis.model.readings,
        n.entry.source,
        log.header.tank.volume_m3,
        basis.model.initial,
      );
    const rel = relative(process.cwd(), file);
    out.push({ log: rel && !rel.startsWith('..') ? rel : file, file, mol });
  }
  return out;
}

/** a premix log as the report of its batch shows it */
export function premixLogReport(r: PremixRecord): NonNullable<CheckReport['premixLogs']>[number] {
  return {
    log: r.named,
    path: r.path,
    id: r.log.header.id,
    tank: r.tank.id,
    lastEntrySha256: r.lastEntrySha256,
    composition: Object.fromEntries(
      r.result.species.map((k) => [
        k,
        { value: r.result.composition[k].value, u: r.result.composition[k].u },
      ]),
    ),
  };
}
