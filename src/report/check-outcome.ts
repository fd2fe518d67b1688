/**
 * The outcome of a re-check as a whole: the composition's own judgement (`pass`, `pass-uncertain`,
 * `fail`, `no-design`) is one part of it; the record beside it (a danger, a plan danger nobody
 * acknowledged, hazards accepted at the manifold, an altered record, a fill never closed) can make
 * a composition within tolerance no pass. One function lists what stands against a pass, in the
 * precedence of the exit codes (README "Exit codes": 4, 3, 6, 5, 7), so the JSON `verdict`, the
 * label and the exit code (cli/commands/check.ts `checkExit`) never disagree.
 */

/**
 * what a composition within tolerance is where something else makes the re-check no pass: the
 * composition alone, which does not make the tank usable (check's text, folder rows and label say so
 * wherever they speak of it; tests/cli/check-no-pass-wording.test.ts)
 */
export const COMPOSITION_ALONE_NOT_USABLE = 'which does not make the tank usable';

/** what stands against a pass, each with its exit code in the cli (EXIT) */
export type CheckOutcome =
  | 'incomplete'
  | 'fail'
  | 'danger'
  | 'plan-danger-not-acknowledged'
  | 'recorded-fill-danger'
  | 'accepted-hazard'
  | 'record-altered'
  | 'premix-drawn-early'
  | 'not-shown-within-tolerance'
  | 'no-design'
  | 'not-closed';

/** the parts of a re-check report the outcome reads (also what the fill's end screen hands the shell) */
export interface OutcomeInput {
  readonly verdict: { readonly verdict: string };
  readonly incomplete?: readonly string[];
  readonly findings: readonly { readonly severity: string }[];
  readonly record?: {
    readonly alteredLines: readonly number[];
    readonly closed?: boolean;
    readonly acceptedHazards?: readonly unknown[];
  };
  /** danger findings of the plan that the record shows nobody acknowledged */
  readonly planDangersNotAcknowledged?: readonly unknown[];
  /** dangers of the review of the fill as recorded that the record does not show accepted */
  readonly recordedFillDangers?: readonly unknown[];
  /** stage 2: the premix tank's checks; one confirmed mixed before its least mixing time is `early` */
  readonly premixChecks?: readonly { readonly kind: string; readonly early?: unknown }[];
}

/**
 * Every outcome that stands against a pass, in exit precedence: out of tolerance or incomplete (4),
 * a danger in the record (3), a plan danger not acknowledged, a danger in the fill as recorded that
 * the record does not show accepted, then hazards accepted (6), an altered
 * record (5), not shown within tolerance, no design, not closed (7). Empty: a pass.
 */
export function checkOutcomes(r: OutcomeInput): CheckOutcome[] {
  const out: CheckOutcome[] = [];
  const incomplete = Boolean(r.incomplete?.length);
  if (incomplete) out.push('incomplete');
  else if (r.verdict.verdict === 'fail') out.push('fail');
  if (r.findings.some((f) => f.severity === 'danger')) out.push('danger');
  if (r.planDangersNotAcknowledged?.length) out.push('plan-danger-not-acknowledged');
  if (r.recordedFillDangers?.length) out.push('recorded-fill-danger');
  if (r.record?.acceptedHazards?.length) out.push('accepted-hazard');
  if (r.record?.alteredLines.length) out.push('record-altered');
  // a premix drawn before its least mixing time: the uniform premix the re-check assumes is not shown
  if (r.premixChecks?.some((c) => c.kind === 'mixed' && c.early)) out.push('premix-drawn-early');
  if (r.verdict.verdict === 'pass-uncertain') out.push('not-shown-within-tolerance');
  if (r.verdict.verdict === 'no-design') out.push('no-design');
  // an incomplete batch says so first; a log never closed is not a pass whatever its numbers
  if (r.record?.closed === false && !incomplete) out.push('not-closed');
  return out;
}

/** the re-check's overall verdict: `pass` only when nothing stands against it, else the first outcome */
export function overallVerdict(r: OutcomeInput): CheckOutcome | 'pass' {
  return checkOutcomes(r)[0] ?? 'pass';
}
