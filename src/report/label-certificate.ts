/**
 * The one-page batch certificate: design against the as-filled composition with its
 * expanded uncertainty, phi and dilution, the readings as logged (time, initials, note),
 * corrections and withdrawals (who, when, old, new, why), acknowledgements, the record
 * findings of the log, the verdict with its caveats and the tank label. Built from
 * the re-check report and the parsed log only; the renderers (label-render.ts) are pure
 * functions of this model.
 */
import { resolveSpeciesKey, speciesRole, STANDING_CAUTION } from '../core/index.js';
import {
  premixCheckText,
  readerOf,
  type CheckReport,
  type LoggedReading,
  type LogView,
} from './check-types.js';
import { premixPressure } from './check-report.js';
import { COMPOSITION_ALONE_NOT_USABLE } from './check-outcome.js';
import { fromPa, isPressureUnit, type PressureUnit } from './units.js';
import { decimalsFor, fixedSig, mixtureTitle, tankName } from './format.js';
import { labelLines, labelModel, outcomeLeads, type LabelModel } from './label-model.js';
import { chargesOf, chargeSuffix, type ChargeOf } from './charges.js';
import { tankHazards } from './tank-hazards.js';

export interface CertificateRow {
  readonly species: string;
  readonly design: string;
  readonly asFilled: string;
  readonly deviation: string;
  readonly tolerance: string;
  /** "within", "inside, not shown", "OUT", or "-" for a species not in the design */
  readonly status: string;
}

export interface CertificateReading {
  readonly step: number;
  readonly fill: string;
  readonly gauge: string;
  readonly typed: string;
  readonly absolute: string;
  readonly temperature: string;
  readonly time: string;
  readonly by: string;
  readonly note: string;
}

export interface CertificateModel {
  readonly title: string;
  readonly batchId: string;
  readonly lab: string;
  readonly tank: string;
  readonly created: string;
  readonly closed: string;
  readonly paper: 'a4' | 'letter';
  readonly version: string;
  readonly file: string;
  readonly generated: string;
  readonly label: LabelModel;
  readonly labelLines: readonly string[];
  readonly verdictText: string;
  /** what stands beside the verdict (report.caveats): a danger in the record, an edited record */
  readonly caveats: readonly string[];
  /** the premixes the batch was made from, one paragraph each (empty for a batch of cylinders) */
  readonly premix: readonly string[];
  readonly rows: readonly CertificateRow[];
  readonly phi: readonly [string, string];
  readonly dilution: readonly [string, string];
  readonly readings: readonly CertificateReading[];
  readonly corrections: readonly string[];
  readonly acknowledgements: readonly string[];
  readonly findings: readonly { readonly severity: string; readonly text: string }[];
  readonly method: string;
  readonly caution: string;
}

export interface CertificateMeta {
  readonly version: string;
  readonly paper: 'a4' | 'letter';
  /** when the certificate is made (ISO time); a parameter so a document is reproducible */
  readonly generated: string;
}

/** what stands against a pass beside a composition within tolerance, leading the certificate's verdict */
const OUTCOME_TEXT: Record<string, string> = {
  'plan-danger-not-acknowledged':
    "NOT A PASS - PLAN DANGER NOT ACKNOWLEDGED: the plan's safety review found a danger and the log " +
    'records no acknowledgement of it (see below).',
  'recorded-fill-danger':
    'NOT A PASS - DANGER IN THE RECORDED FILL: the safety review of the fill as recorded finds a danger ' +
    'that the log does not show accepted (see below).',
  'accepted-hazard':
    'NOT A PASS - ACCEPTED HAZARD: the fill went on through hazards accepted at the manifold (see below).',
  'premix-drawn-early':
    'NOT A PASS - PREMIX DRAWN EARLY: the batch drew from its premix before the least mixing time, ' +
    'confirmed as mixed early; the re-check assumes a uniform premix, which the record does not show (see below).',
  'not-closed':
    'NOT A PASS - NOT CLOSED: the fill never ended with a close entry; gas may have gone in after the ' +
    'last reading.',
};

/** the certificate's verdict: a danger, a plan danger, accepted hazards or an open log before the composition */
function certificateVerdict(label: LabelModel): string {
  if (label.danger && label.pastRange)
    return (
      `NOT A PASS. The composition only: not shown within tolerance, whatever the numbers give: it rests ` +
      `on a reading past its gauge's range (${label.pastRange}), which is not trustworthy. Beside it the ` +
      `log records a danger (below), and the tank is not fit to use.`
    );
  if (label.danger)
    return COMPOSITION_TEXT[label.status]
      ? `NOT A PASS. The composition only: ${COMPOSITION_TEXT[label.status]} Beside it the log records ` +
          `a danger (below), and the tank is not fit to use.`
      : `${VERDICT_TEXT[label.status]} This is the composition only: the log records ` +
          `a danger (below), and the tank is not fit to use.`;
  if (outcomeLeads(label))
    return `${OUTCOME_TEXT[label.outcome]} The composition only: ${COMPOSITION_TEXT[label.status]}`;
  return VERDICT_TEXT[label.status];
}

/** the composition's judgement where an outcome of the record leads the verdict (never the word PASS) */
const COMPOSITION_TEXT: Record<string, string> = {
  pass:
    'every design mole fraction is within its tolerance with the expanded uncertainty (k = 2) included, ' +
    `${COMPOSITION_ALONE_NOT_USABLE}.`,
  'pass-uncertain':
    'every design mole fraction is inside its tolerance on the readings, but for some the expanded ' +
    'uncertainty (k = 2) reaches past it.',
};

const VERDICT_TEXT: Record<string, string> = {
  pass: 'PASS - every design mole fraction is within its tolerance with the expanded uncertainty (k = 2) included.',
  'pass-uncertain':
    'NOT SHOWN WITHIN TOLERANCE - every design mole fraction is inside its tolerance on the readings, but ' +
    'for some the expanded uncertainty (k = 2) reaches past it: the measurement ' +
    'cannot prove conformity.',
  fail:
    'FAIL - out of tolerance: the tank does not hold the design mixture. Label ' +
    'it with the as-filled composition below, or re-fill.',
  incomplete:
    'FAIL - incomplete: the log lacks a reading for a planned fill; the composition covers the fills logged so far.',
  'no-design': 'NOT A PASS - no design to compare with: the composition is as measured.',
  'premix-not-checked':
    'NOT RE-CHECKED - a premix log this batch was made from is missing, changed or not usable (see ' +
    'Premix): the composition uses the premix as the batch log recorded it, without its uncertainty; ' +
    'conformity is not shown.',
  'record-altered':
    'NOT A PASS - the batch log was changed after it was written (a line does not match its hash ' +
    'chain; see the record findings): the composition below is computed from the numbers as they ' +
    'stand and proves nothing about the tank. Find the original log, or re-check the tank.',
};

/** where the batch's premix came from, from the logs: each premix log re-checked now, or why not */
function premixText(label: LabelModel): string[] {
  return label.premix.map((p) =>
    p.checked
      ? `Made from premix ${p.id} in tank ${p.tank}: log ${p.log} (last entry ${p.lastEntry}, the one ` +
        `this batch log recorded), re-checked now from its readings by check's model: ` +
        `${p.fractions.join(', ')} (U, k = 2); its budget is part of this batch's.`
      : `Made from the premix in tank ${p.tank}, log ${p.log}: NOT RE-CHECKED - ${p.problem} ` +
        'Restore the premix log as it was and make the label again.',
  );
}

function unitOf(u: string): PressureUnit {
  return isPressureUnit(u) ? u : 'Pa';
}

/** how a reading is named in a correction line: as typed, with the line it sits on */
function readingText(x: LoggedReading | null): string {
  return x ? `${x.reading} (line ${x.line})` : '(no reading in force)';
}

/** corrections and withdrawals as `check` applied them: who, when, old, new, why */
function amendmentLines(r: CheckReport): string[] {
  return r.amendments.map((a) => {
    const who = `by ${a.by ?? 'initials not logged'} at ${shortTime(a.time)}`;
    const why = a.reason ? ` - ${a.reason}` : ' - no reason logged';
    return a.kind === 'correction'
      ? `fill ${a.step}: ${readingText(a.old)} corrected to ${readingText(a.new)}, ` +
          `${who}${why}; the original stays in the log`
      : `fill ${a.step}: ${readingText(a.old)} withdrawn (line ${a.line}), ${who}${why}; the original stays in the log`;
  });
}

/** "2026-11-30T09:20:00Z" -> "2026-11-30 09:20:00 UTC"; other text as logged */
function shortTime(t: string): string {
  const m = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2}(:\d{2})?)(\.\d+)?Z$/.exec(t);
  return m ? `${m[1]} ${m[2]} UTC` : t;
}

/** one row per species: design, as filled with U, deviation, tolerance and status */
function compositionRows(r: CheckReport, label: LabelModel): CertificateRow[] {
  const dev = new Map(r.verdict.deviations.map((d) => [d.species, d]));
  const pct = (x: number) => `${fixedSig(x * 100, 5)} %`;
  // an incomplete batch: a fraction inside its tolerance is so on the fills logged so far, no pass; one
  // outside it is so far, not a final judgement
  const soFar = r.incomplete.length ? ' so far' : '';
  const rows: CertificateRow[] = label.composition.map((c) => {
    const d = dev.get(c.species);
    return {
      species: c.species,
      design: d ? pct(d.design) : '-',
      asFilled: c.text,
      deviation: d
        ? `${d.deviation >= 0 ? '+' : '-'}${fixedSig((Math.abs(d.deviation) / d.design) * 100, 2)} %`
        : '-',
      tolerance: d ? `+-${fixedSig((d.tolerance / d.design) * 100, 2)} %` : '-',
      // a premix not re-checked leaves every fraction unproven, inside or not
      status: !d
        ? '-'
        : label.status === 'premix-not-checked'
          ? 'not shown (premix)'
          : label.status === 'record-altered'
            ? 'not shown (record)'
            : d.pastRange?.length
              ? 'not shown (gauge range)'
              : d.provenWithin
                ? `within${soFar}`
                : d.within
                  ? `inside${soFar}, not shown`
                  : `OUT${soFar}`,
    };
  });
  // a design species the re-check found none of still gets its row
  for (const d of r.verdict.deviations) {
    if (!rows.some((x) => x.species === d.species))
      rows.push({
        species: d.species,
        design: pct(d.design),
        asFilled: 'none found',
        deviation: '-100 %',
        tolerance: `+-${fixedSig((d.tolerance / d.design) * 100, 2)} %`,
        status: `OUT${soFar}`,
      });
  }
  return rows;
}

/** the readings as the re-check used them, with what the log says of each (typed text, time, initials) */
function certificateReadings(r: CheckReport, log: LogView | undefined): CertificateReading[] {
  const byStep = new Map((log?.readings ?? []).map((x) => [x.step, x]));
  const planned = log?.header.steps ?? [];
  const counted = chargesOf(planned);
  const chargeOfStep = new Map<number, ChargeOf>(planned.map((p, i) => [p.step, p.charge ?? counted[i]]));
  const dangerLines = new Set(
    r.findings.filter((f) => f.severity === 'danger' && f.line !== null).map((f) => f.line),
  );
  return r.readings.map((x) => {
    const u = unitOf(x.gauge.unit);
    const dec = Math.max(0, decimalsFor(fromPa(x.gauge.resolutionPa, u)));
    const lr = byStep.get(x.step);
    // who read the gauge (a correction's own initials are its corrector's: said in the note)
    const who = readerOf(lr, r.amendments);
    return {
      step: x.step,
      fill: `${x.source.id}${chargeSuffix(chargeOfStep.get(x.step))}`,
      gauge: `${x.gauge.id}${x.gauge.reference === 'gauge' ? ' (gauge-ref.)' : ''}`,
      typed: lr?.reading ?? '-',
      absolute: `${fromPa(x.pressurePa, u).toFixed(dec)} ${u}`,
      temperature: `${(x.temperatureK - 273.15).toFixed(2)} degC`,
      time: lr?.time ? shortTime(lr.time) : '-',
      by: who.by ?? '-',
      note: [
        lr && dangerLines.has(lr.line) ? 'DANGER: past a limit, see the findings' : '',
        lr?.kind === 'correction'
          ? `corrected${who.corrected?.by ? ` by ${who.corrected.by}` : ''} (replaces line ${lr.replaces_line ?? '?'})`
          : '',
        lr?.note ?? '',
      ]
        .filter(Boolean)
        .join('; '),
    };
  });
}

/**
 * The vents and the readings after venting, as logged, after the fill readings: the vent's target (a
 * target, not what the tank reached) and each reading after it, the last being the tank's final pressure
 */
function ventReadings(r: CheckReport, log: LogView | undefined): CertificateReading[] {
  // as the fill readings show them: in the gauge's unit, to its resolution
  const shownOf = new Map(
    r.readings.map((x) => {
      const u = unitOf(x.gauge.unit);
      const dec = Math.max(0, decimalsFor(fromPa(x.gauge.resolutionPa, u)));
      return [x.gauge.id, (pa: number) => `${fromPa(pa, u).toFixed(dec)} ${u}`] as const;
    }),
  );
  const unitOfStep = new Map(r.readings.map((x) => [x.step, unitOf(x.gauge.unit)]));
  const dangerLines = new Set(
    r.findings.filter((f) => f.severity === 'danger' && f.line !== null).map((f) => f.line),
  );
  const limitOf = new Map(
    r.findings.flatMap((f) => (f.code === 'above-working-limit' ? [[f.line, f.message] as const] : [])),
  );
  const vents = log?.vents ?? [];
  return vents.flatMap((v, vi) => {
    const u = unitOfStep.get(v.step) ?? 'Torr';
    const rows: CertificateReading[] = [
      {
        step: v.step,
        fill: 'vent',
        gauge: '-',
        typed: '-',
        absolute: '-',
        temperature: '-',
        time: shortTime(v.time),
        by: v.by,
        note:
          `vented (line ${v.line}); target to vent to: at most ` +
          `${Number(fromPa(v.target_Pa, u).toPrecision(6))} ${u} absolute`,
      },
    ];
    v.readings.forEach((x, i) => {
      const final = vi === vents.length - 1 && i === v.readings.length - 1;
      rows.push({
        step: v.step,
        fill: 'after venting',
        gauge: x.gauge,
        typed: x.reading,
        absolute: shownOf.get(x.gauge)?.(x.pressure_Pa) ?? `${fixedSig(fromPa(x.pressure_Pa, u), 6)} ${u}`,
        temperature: `${(x.temperature_K - 273.15).toFixed(2)} degC`,
        time: shortTime(x.time),
        by: x.by,
        note: [
          dangerLines.has(x.line) ? 'DANGER: past a limit, see the findings' : '',
          limitOf.has(x.line) && !final
            ? 'still above the working limit; vented again and read again after it'
            : '',
          final ? "the tank's final pressure" : '',
        ]
          .filter(Boolean)
          .join('; '),
      });
    });
    return rows;
  });
}

/**
 * the check's warnings, the record's findings, the plan's findings (planned values), the review of the
 * fill as recorded and the hazards of the gas as filled, dangers first
 */
function certificateFindings(r: CheckReport, log: LogView | undefined): { severity: string; text: string }[] {
  const findings: { severity: string; text: string }[] = [];
  // what the re-check found in the log (warnings of the check, e.g. a torn line or an unacknowledged danger)
  for (const w of r.warnings)
    if (!/^danger finding .* was acknowledged by/.test(w)) findings.push({ severity: 'check', text: w });
  // the log as a record (readings past a limit, edited lines, text and number that disagree), worded once
  for (const f of r.findings) findings.push({ severity: f.severity, text: f.message });
  // the plan's findings are of the planned values; the fill as recorded and the gas as filled are said apart
  for (const f of log?.header.findings ?? [])
    if (f.code !== 'isolate-gauge')
      findings.push({
        severity: f.severity,
        text: `${f.code}${f.step ? ` (fill ${f.step})` : ''}: ${f.message}`,
      });
  for (const f of r.recordedFill?.findings ?? [])
    findings.push({
      severity: f.severity,
      text:
        `as filled: ${f.code}${f.step ? ` (fill ${f.step})` : ''}` +
        `${f.accepted ? ' (accepted in the log)' : ''}: ${f.message}`,
    });
  // the gas as filled: flammable in air, oxygen-enriched (tank-hazards.ts, the label's marks)
  for (const f of tankHazards(r, log).findings)
    findings.push({ severity: f.severity, text: `as filled (the finished gas): ${f.code}: ${f.text}` });
  const order = ['danger', 'check', 'warning', 'note'];
  findings.sort((a, b) => order.indexOf(a.severity) - order.indexOf(b.severity));
  return findings;
}

/** how the composition and its uncertainty were computed, with the barometer and thermometer used */
function methodText(r: CheckReport, h: LogView['header'] | undefined): string {
  const baro = h
    ? `Barometer ${fixedSig(fromPa(h.barometer.pressure_Pa, 'Torr'), 5)} Torr (u ` +
      `${fixedSig(fromPa(h.barometer.u_Pa, 'Torr'), 2)} Torr) for gauge-referenced readings. `
    : '';
  const thermo = h
    ? `Thermometer u ${h.thermometer.u_K} K, resolution ${h.thermometer.resolution_K} K. `
    : '';
  return (
    `Composition from the logged readings by the real-gas inverse model of mixwright ` +
    `check; uncertainty by the GUM law of propagation (JCGM 100), U = 2u (k = 2)` +
    (r.result.trials > 0
      ? `, checked by Monte Carlo (JCGM 101, ${r.result.trials} trials, seed ${r.result.seed}). `
      : '. ') +
    baro +
    thermo +
    (r.result.unidentified > 0
      ? `Unidentified cylinder impurity ${fixedSig(r.result.unidentified * 1e6, 3)} ppm, not in the fractions.`
      : '')
  );
}

/**
 * A stage-1 log carries the recipe of its batch: its certificate says it is the premix of that
 * batch, with the premix's own gases and tank, never the batch's title alone (which names the
 * batch's gases, pressure and tank)
 */
function stageTitle(title: string, r: CheckReport, tank: string): string {
  const st = r.stage;
  if (st?.number !== 1) return title;
  const design = r.design?.composition ?? {};
  const gases = Object.keys(design)
    .filter((k) => design[k] > 0)
    .sort((a, b) => design[b] - design[a]);
  return `premix of batch ${st.batch} (stage 1 of 2; the batch: ${title}): ${gases.join('/')} in ${tank}`;
}

/**
 * The certificate's title from the batch's own values (its design, planned final pressure and tank, as
 * the log header records them), never the recipe's title alone: a batch filled with other options than
 * its recipe (--pressure) keeps the recipe's title, which states the recipe's values. Where the recipe's
 * title says other than the batch's own, it is quoted after it as the recipe's.
 */
function batchTitle(h: LogView['header']): string {
  const d = h.design;
  const diluent = Object.fromEntries(h.design.diluent.map((k) => [k, d.composition[k] ?? 0]));
  const fuel: Record<string, number> = {};
  const oxidizer: Record<string, number> = {};
  for (const [k, v] of Object.entries(d.composition)) {
    if (k in diluent || !(v > 0)) continue;
    // a known species by its role; the rest of an oxidizer blend (the N2 of air) with the oxidizer
    if (resolveSpeciesKey(k) && speciesRole(k) === 'fuel') fuel[k] = v;
    else oxidizer[k] = v;
  }
  const recipe = h.recipe as { title?: unknown; pressure?: unknown } | undefined;
  const typed = typeof recipe?.pressure === 'string' ? recipe.pressure.trim().split(/\s+/).pop() : undefined;
  const unit: PressureUnit = typed && isPressureUnit(typed) ? typed : 'Torr';
  const own = mixtureTitle(
    {
      composition: d.composition,
      phi: d.phi ?? undefined,
      diluentFraction: d.diluent_fraction,
      groups: { fuel, oxidizer, diluent },
    },
    h.final_pressure_Pa,
    tankName(h.tank.id),
    unit,
  );
  const theirs = typeof recipe?.title === 'string' ? recipe.title : undefined;
  if (!theirs) return own;
  return titleAgrees(theirs, h) ? theirs : `${own} (recipe "${theirs}")`;
}

/** how far a value the title states may be from the batch's own, relative (the title's rounding) */
const TITLE_ROUNDING = 0.005;

/**
 * whether a recipe's title states nothing against the batch: every pressure it gives ("500 Torr",
 * "2 bar") within TITLE_ROUNDING of the batch's planned final pressure, a phi it gives of the batch's
 * phi, and a tank it ends with ("in MT-2") the batch's. A title that states none of them agrees.
 */
function titleAgrees(title: string, h: LogView['header']): boolean {
  const near = (a: number, b: number) => Math.abs(a - b) <= TITLE_ROUNDING * Math.abs(b);
  for (const m of title.matchAll(/(\d+(?:\.\d+)?)\s*(Torr|kPa|mbar|bar|psi|Pa|atm)\b/g)) {
    const unit = m[2] as PressureUnit;
    if (!near(Number(m[1]), fromPa(h.final_pressure_Pa, unit))) return false;
  }
  const phi = /\bphi\s*(\d+(?:\.\d+)?)/.exec(title);
  if (phi && !(h.design.phi !== null && near(Number(phi[1]), h.design.phi))) return false;
  const tank = /\bin\s+(\S+)\s*$/.exec(title);
  return !tank || tank[1] === h.tank.id || !/\d/.test(tank[1]);
}

/**
 * what the certificate's findings are of: the plan's (in its header) at its planned values, those
 * marked "as filled" from the readings (the fill as recorded, the gas as filled)
 */
export const FINDINGS_KEY = 'the plan\'s at its planned values; "as filled": from the readings';

/** the tank as the log names it: volume and rating */
function tankText(h: LogView['header'] | undefined, label: LabelModel): string {
  if (!h) return label.tank;
  const rated = h.tank.rated_pressure_Pa
    ? `, rated ${fixedSig(fromPa(h.tank.rated_pressure_Pa, 'Torr'), 4)} Torr`
    : ', rating not known';
  return `${tankName(h.tank.id)}, ${fixedSig(h.tank.volume_m3 * 1000, 4)} L${rated}`;
}

export function buildCertificateModel(
  r: CheckReport,
  log: LogView | undefined,
  meta: CertificateMeta,
): CertificateModel {
  const label = labelModel(r, log);
  const h = log?.header;
  const pct = (x: number) => `${fixedSig(x * 100, 5)} %`;
  const phi: [string, string] = [
    r.design?.phi !== undefined ? r.design.phi.toFixed(4) : 'n/a',
    label.phi ?? 'n/a',
  ];
  const dilution: [string, string] = [
    r.design ? pct(r.design.diluentFraction) : 'n/a',
    label.dilution ?? 'n/a',
  ];
  const acknowledgements = [
    // stage 2: the premix confirmed mixed and read before the first fill from it (refused readings too)
    ...(r.premixChecks ?? []).map((c) => premixCheckText(c, premixPressure)),
    ...(log?.acknowledgements ?? []).map(
      (a) =>
        `${a.code}${a.step ? ` (fill ${a.step})` : ''}: ${ackVerb(a)} by ${a.by} at ${a.time}` +
        (a.note ? ` - ${a.note}` : ''),
    ),
    ...(log?.vents ?? []).map(
      (v) =>
        `above-working-limit (fill ${v.step}): vent chosen by ${v.by} at ${v.time} (line ${v.line}); ` +
        (v.readings.length
          ? `read after venting ${v.readings.length === 1 ? 'once' : `${v.readings.length} times`}`
          : 'NOT read after venting'),
    ),
  ];
  const recipe = h?.recipe as { title?: unknown; id?: unknown } | undefined;
  const recipeTitle =
    typeof recipe?.title === 'string' ? recipe.title : typeof recipe?.id === 'string' ? recipe.id : r.id;
  // a premix (stage 1) names the batch it is made for by that batch's recipe; a batch by its own values
  const title = r.stage?.number === 1 || !h ? recipeTitle : batchTitle(h);
  return {
    title: stageTitle(title, r, h?.tank.id ?? label.tank),
    batchId: r.id,
    lab: label.lab,
    tank: tankText(h, label),
    created: h?.created ? shortTime(h.created) : '-',
    closed: log
      ? log.closed
        ? 'closed'
        : 'NOT CLOSED - the fill may not be finished'
      : 'CSV readings, no log',
    paper: meta.paper,
    version: meta.version,
    file: r.file,
    generated: meta.generated,
    label,
    labelLines: labelLines(label),
    verdictText: certificateVerdict(label),
    caveats: r.caveats,
    premix: premixText(label),
    rows: compositionRows(r, label),
    phi,
    dilution,
    readings: [...certificateReadings(r, log), ...ventReadings(r, log)],
    corrections: amendmentLines(r),
    acknowledgements,
    findings: certificateFindings(r, log),
    method: methodText(r, h),
    caution:
      `The composition is computed from the logged readings and is only as good ` +
      `as they are. ${STANDING_CAUTION}`,
  };
}

/** what an acknowledgement of the log records, in a word: a stop is never called accepted */
function ackVerb(a: {
  readonly below?: unknown;
  readonly review?: { readonly outcome: string };
  readonly cap?: { readonly outcome: string };
  readonly over_range?: { readonly outcome: string };
}): string {
  const typed = { typed: 'logged as typed', slip: 'said to be a typing slip', 're-read': 're-read' } as const;
  const o = a.over_range?.outcome;
  if (o) return o in typed ? typed[o as keyof typeof typed] : o;
  if (a.review?.outcome === 'stopped' || a.cap?.outcome === 'stopped') return 'batch stopped';
  if (a.review?.outcome === 'safer-stop') return 'safer stop chosen';
  return a.below ? 'chosen' : 'accepted';
}
