/**
 * The design wizard as a pure state machine: a column of fields (each validated as
 * typed, with its reason beside it), type-ahead over the species, a live preview of
 * the composition, fill steps and findings, and three actions at the bottom (save the
 * recipe, write the fill sheet, start the guided fill). The preview comes from an
 * evaluator the shell passes in, so that this module stays free of files.
 *
 * The wizard keeps work: Esc (or Ctrl-C) with changes not saved as a recipe asks before
 * leaving, and an action whose file exists comes back from the shell as a question naming the
 * file (y replaces it, n keeps it); a pending question takes the next key.
 */
import { getSpecies, rankSpecies } from '../core/index.js';

export const FIELDS = [
  'id',
  'fuel',
  'oxidizer',
  'phi',
  'diluent',
  'dilution',
  'tank',
  'premix',
  'pressure',
  'temperature',
] as const;
export type FieldName = (typeof FIELDS)[number];
export const ACTIONS = ['save recipe', 'write fill sheet', 'start guided fill'] as const;
export type ActionName = (typeof ACTIONS)[number];

export const FIELD_HELP: Record<FieldName, string> = {
  id: 'a short name for the design (letters, digits, - _)',
  fuel: 'species or blend: CH4, or CH4:0.9,C2H6:0.1',
  oxidizer: 'O2, air, or a blend O2:0.21,N2:0.79',
  phi: 'equivalence ratio, > 0',
  diluent: 'bath gas: Ar, or Ar:0.5,He:0.5 (empty: none)',
  dilution: 'diluent mole fraction, 0 to below 1',
  tank: 'a tank of the lab profile, or a volume such as 30 L',
  premix: 'two stages: a tank to make a premix in (MT-2) or a premix log (.jsonl); empty: one',
  pressure: 'final pressure such as 1500 Torr, or 40 exp (enough for 40 experiments)',
  temperature: 'tank temperature such as 22 degC',
};

export interface Preview {
  readonly lines: readonly string[];
  readonly danger: boolean;
}

export interface Evaluation {
  readonly preview?: Preview;
  /**
   * a two-stage design: its plan (about a second) is evaluated after a pause in typing, not on every
   * key (the screen sends `evaluated`); until then the preview says it is waiting
   */
  readonly pending?: boolean;
  /** the first problem, with the field it concerns */
  readonly error?: { readonly field?: FieldName; readonly message: string };
}

/** a yes/no question on screen; the next key answers it */
export interface Question {
  readonly kind: 'replace' | 'leave';
  readonly text: string;
  /** replace: the action to carry out again, replacing the file, on yes */
  readonly action?: ActionName;
  readonly file?: string;
}

export interface WizardState {
  readonly values: Readonly<Record<FieldName, string>>;
  /** index into FIELDS, then ACTIONS */
  readonly focus: number;
  readonly evaluation: Evaluation;
  readonly message?: string;
  /** an action the shell must carry out, set by Enter on an action (or by yes to a replace question) */
  readonly request?: ActionName;
  /** with request: the user said yes to replacing the existing file */
  readonly replace?: boolean;
  /** the values as last saved to a recipe, or as the wizard opened: Esc compares with these */
  readonly savedValues: Readonly<Record<FieldName, string>>;
  readonly question?: Question;
  /** the user chose to leave (nothing unsaved, or yes to the question): the shell ends the wizard */
  readonly quit?: boolean;
}

/** what the shell reports back after carrying out an action */
export type ActOutcome =
  | {
      readonly kind: 'message';
      readonly text: string;
      /** the recipe file now holds the values on screen */ readonly savedRecipe?: boolean;
    }
  | { readonly kind: 'confirm'; readonly action: ActionName; readonly file: string; readonly text: string };

export type WizardAction =
  | { readonly type: 'char'; readonly text: string }
  | { readonly type: 'backspace' }
  | { readonly type: 'up' }
  | { readonly type: 'down' }
  | { readonly type: 'enter' }
  | { readonly type: 'complete' }
  /** Esc or Ctrl-C */
  | { readonly type: 'escape' }
  | { readonly type: 'result'; readonly outcome: ActOutcome }
  /** the full (two-stage) evaluation of `values`, made after a pause in typing: taken if they are still on screen */
  | {
      readonly type: 'evaluated';
      readonly values: Readonly<Record<FieldName, string>>;
      readonly evaluation: Evaluation;
    }
  | { readonly type: 'done'; readonly message: string };

/** `full`: evaluate a two-stage design now (else it comes back `pending`, for a pause in typing) */
export type Evaluate = (values: Readonly<Record<FieldName, string>>, full?: boolean) => Evaluation;

export const DEFAULTS: Record<FieldName, string> = {
  id: 'my-design',
  fuel: 'CH4',
  oxidizer: 'O2',
  phi: '1',
  diluent: 'Ar',
  dilution: '0.95',
  tank: '',
  premix: '',
  pressure: '1500 Torr',
  temperature: '22 degC',
};

export function wizardInit(evaluate: Evaluate, values: Record<FieldName, string> = DEFAULTS): WizardState {
  return { values, focus: 1, evaluation: evaluate(values), savedValues: values };
}

/** the fields whose values differ from the last saved recipe (or from the opening values) */
export function unsavedFields(s: WizardState): FieldName[] {
  return FIELDS.filter((f) => s.values[f] !== s.savedValues[f]);
}

export const SPECIES_FIELDS: readonly FieldName[] = ['fuel', 'oxidizer', 'diluent'];

export interface Completion {
  /** the species part of the last blend entry, as typed */
  readonly query: string;
  /** rankFor(field, query): the same list, in the same order, as the "did you mean" of an unknown species */
  readonly ranked: readonly string[];
  /** the species key Tab puts in place of the query: ranked[0], unless the query is already that key */
  readonly target?: string;
}

/**
 * The ranking the wizard offers for a typed name: rankSpecies (the core's "did you mean"), with
 * "air" first where a whole oxidizer may be air (the lab profile's air, not a species). The
 * evaluator words an unknown species' "did you mean" from this same function.
 */
export function rankFor(field: FieldName | undefined, query: string, wholeField: boolean): string[] {
  const ranked = rankSpecies(query);
  const q = query.trim().toLowerCase();
  return field === 'oxidizer' && wholeField && q && 'air'.startsWith(q) ? ['air', ...ranked] : ranked;
}

/** Tab completion of the last entry of a blend ("CH4:0.9,C2H" completes "C2H") */
export function completionOf(text: string, field?: FieldName): Completion {
  const query = text.split(',').pop()!.split(':')[0].trim();
  const ranked = rankFor(field, query, !/[,:]/.test(text));
  const target = ranked.length && ranked[0] !== query ? ranked[0] : undefined;
  return { query, ranked, target };
}

/** the one line under the help: what Tab will do in a species field */
export function completionLine(text: string, field?: FieldName): string {
  const c = completionOf(text, field);
  if (!c.query) return '';
  const label = (k: string) => (k === 'air' ? "air (the lab profile's air)" : `${k} (${getSpecies(k).name})`);
  if (!c.ranked.length)
    return `no known species starts with or is close to "${c.query}"; \`mixwright species\` lists them`;
  if (!c.target) return `${label(c.ranked[0])}: ${c.ranked[0] === 'air' ? 'known' : 'a known species'}`;
  const also = c.ranked.slice(1, 5);
  return `Tab: ${label(c.target)}${also.length ? `   also: ${also.join(' ')}` : ''}`;
}

function completeBlend(text: string, field: FieldName): string {
  const { target } = completionOf(text, field);
  if (!target) return text;
  const parts = text.split(',');
  const lastPart = parts.pop()!;
  const lead = /^\s*/.exec(lastPart)![0];
  const frac = lastPart.includes(':') ? lastPart.slice(lastPart.indexOf(':')) : '';
  return [...parts, lead + target + frac].join(',');
}

export function currentField(s: WizardState): FieldName | undefined {
  return s.focus < FIELDS.length ? FIELDS[s.focus] : undefined;
}

function answer(s: WizardState, q: Question, yes: boolean): WizardState {
  const base: WizardState = { ...s, question: undefined };
  if (q.kind === 'leave')
    return yes
      ? { ...base, quit: true, message: undefined }
      : { ...base, message: 'staying: the design is kept on screen; [save recipe] is below the fields' };
  if (yes) return { ...base, request: q.action, replace: true, message: undefined };
  return {
    ...base,
    message:
      `kept ${q.file} as it was; nothing written. To keep both, change the id and ` +
      `${q.action === 'save recipe' ? 'save' : 'write'} again`,
  };
}

function answerKey(s: WizardState, q: Question, a: WizardAction): WizardState {
  if (a.type === 'char') {
    const t = a.text.trim().toLowerCase();
    if (t === 'y' || t === 'yes') return answer(s, q, true);
    if (t === 'n' || t === 'no') return answer(s, q, false);
  }
  if (a.type === 'escape' || a.type === 'enter') return answer(s, q, false);
  return { ...s, message: 'answer the question first: y for yes, n (or Enter, Esc) for no' };
}

export function wizardReducer(s: WizardState, a: WizardAction, evaluate: Evaluate): WizardState {
  const base: WizardState = { ...s, request: undefined, replace: undefined };
  if (base.question && a.type !== 'result' && a.type !== 'done') return answerKey(base, base.question, a);
  const field = currentField(base);
  const total = FIELDS.length + ACTIONS.length;
  const withValue = (name: FieldName, v: string): WizardState => {
    const values = { ...base.values, [name]: v };
    return { ...base, values, evaluation: evaluate(values), message: undefined };
  };
  switch (a.type) {
    case 'char':
      return field
        ? withValue(field, base.values[field] + a.text)
        : {
            ...base,
            message:
              `"${a.text}" not taken: the cursor is on [${ACTIONS[base.focus - FIELDS.length]}]; ` +
              `Up moves to the fields, Enter does the action`,
          };
    case 'backspace':
      return field ? withValue(field, base.values[field].slice(0, -1)) : base;
    case 'up':
      return { ...base, focus: (base.focus - 1 + total) % total };
    case 'down':
      return { ...base, focus: (base.focus + 1) % total };
    case 'complete': {
      if (!field || !SPECIES_FIELDS.includes(field))
        return { ...base, message: 'Tab completes a species name in fuel, oxidizer and diluent' };
      const c = completionOf(base.values[field], field);
      if (c.query && !c.ranked.length) return { ...base, message: completionLine(base.values[field], field) };
      return withValue(field, completeBlend(base.values[field], field));
    }
    case 'escape': {
      const changed = unsavedFields(base);
      if (!changed.length) return { ...base, quit: true };
      const text =
        `The design has changes not saved as a recipe (${changed.join(', ')}). Leave ` +
        `without saving? y: leave and lose them   n: stay`;
      return { ...base, question: { kind: 'leave', text }, message: undefined };
    }
    case 'result': {
      const o = a.outcome;
      if (o.kind === 'confirm')
        return {
          ...base,
          question: { kind: 'replace', text: o.text, action: o.action, file: o.file },
          message: undefined,
        };
      return { ...base, message: o.text, savedValues: o.savedRecipe ? base.values : base.savedValues };
    }
    case 'enter': {
      if (field) return { ...base, focus: base.focus + 1 };
      const action = ACTIONS[base.focus - FIELDS.length];
      // the action is checked against the plan it carries out, whenever Enter comes: a design still
      // waiting for its pause in typing (only the quick check made) is planned in full now
      const evaluation = base.evaluation.pending ? evaluate(base.values, true) : base.evaluation;
      const now: WizardState = { ...base, evaluation };
      const err = evaluation.error;
      if (err)
        return {
          ...now,
          message: `${action} refused: fix the design first (${err.field ?? 'the design'}, marked !): ${err.message}`,
        };
      if (action === 'start guided fill' && evaluation.preview?.danger) {
        return {
          ...now,
          request: action,
          message: 'danger findings stand: the guided fill will ask you to acknowledge them',
        };
      }
      return { ...now, request: action };
    }
    case 'done':
      return { ...base, message: a.message };
    case 'evaluated':
      // a result for values no longer on screen (typed on meanwhile) is dropped: the next pause brings its own
      return FIELDS.every((f) => a.values[f] === base.values[f])
        ? { ...base, evaluation: a.evaluation }
        : base;
  }
}
