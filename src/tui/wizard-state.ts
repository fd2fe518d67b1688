/**
 * The design wizard as a pure state machine: a column of fields (each validated as
 * typed, with its reason beside it), type-ahead over the species, a live preview of
 * the composition, fill steps and findings, and three actions at the bottom (save the
 * recipe, write the fill sheet, start the guided fill). The preview comes from an
 * evaluator the shell passes in, so that this module stays free of files.
 */
import { getSpecies, speciesKeys } from '../core/index.js';

export const FIELDS = ['id', 'fuel', 'oxidizer', 'phi', 'diluent', 'dilution', 'tank', 'pressure', 'temperature'] as const;
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
  pressure: 'final pressure such as 1500 Torr, or 40 exp (enough for 40 experiments)',
  temperature: 'tank temperature such as 22 degC',
};

export interface Preview {
  readonly lines: readonly string[];
  readonly danger: boolean;
}

export interface Evaluation {
  readonly preview?: Preview;
  /** the first problem, with the field it concerns */
  readonly error?: { readonly field?: FieldName; readonly message: string };
}

export interface WizardState {
  readonly values: Readonly<Record<FieldName, string>>;
  /** index into FIELDS, then ACTIONS */
  readonly focus: number;
  readonly evaluation: Evaluation;
  readonly message?: string;
  /** an action the shell must carry out, set by Enter on an action */
  readonly request?: ActionName;
}

export type WizardAction =
  | { readonly type: 'char'; readonly text: string }
  | { readonly type: 'backspace' }
  | { readonly type: 'up' }
  | { readonly type: 'down' }
  | { readonly type: 'enter' }
  | { readonly type: 'complete' }
  | { readonly type: 'done'; readonly message: string };

export type Evaluate = (values: Readonly<Record<FieldName, string>>) => Evaluation;

export const DEFAULTS: Record<FieldName, string> = {
  id: 'my-design',
  fuel: 'CH4',
  oxidizer: 'O2',
  phi: '1',
  diluent: 'Ar',
  dilution: '0.95',
  tank: '',
  pressure: '1500 Torr',
  temperature: '22 degC',
};

export function wizardInit(evaluate: Evaluate, values: Record<FieldName, string> = DEFAULTS): WizardState {
  return { values, focus: 1, evaluation: evaluate(values) };
}

const ALL_NAMES = () => speciesKeys().flatMap((k) => [k, ...getSpecies(k).aliases]);

/** species keys that start with what is being typed in the last blend entry */
export function typeAhead(text: string): string[] {
  const last = text.split(',').pop()!.split(':')[0].trim();
  if (!last) return [];
  const q = last.toLowerCase();
  const hits = ALL_NAMES().filter((n) => n.toLowerCase().startsWith(q) && n !== last);
  return [...new Set(hits)].slice(0, 6);
}

function completeBlend(text: string): string {
  const hits = typeAhead(text);
  if (!hits.length) return text;
  const parts = text.split(',');
  const lastPart = parts.pop()!;
  const frac = lastPart.includes(':') ? lastPart.slice(lastPart.indexOf(':')) : '';
  return [...parts, hits[0] + frac].join(',');
}

export function currentField(s: WizardState): FieldName | undefined {
  return s.focus < FIELDS.length ? FIELDS[s.focus] : undefined;
}

export function wizardReducer(s: WizardState, a: WizardAction, evaluate: Evaluate): WizardState {
  const base: WizardState = { ...s, request: undefined };
  const field = currentField(base);
  const total = FIELDS.length + ACTIONS.length;
  const withValue = (name: FieldName, v: string): WizardState => {
    const values = { ...base.values, [name]: v };
    return { ...base, values, evaluation: evaluate(values), message: undefined };
  };
  switch (a.type) {
    case 'char':
      return field ? withValue(field, base.values[field] + a.text) : base;
    case 'backspace':
      return field ? withValue(field, base.values[field].slice(0, -1)) : base;
    case 'up':
      return { ...base, focus: (base.focus - 1 + total) % total };
    case 'down':
      return { ...base, focus: (base.focus + 1) % total };
    case 'complete':
      return field && ['fuel', 'oxidizer', 'diluent'].includes(field) ? withValue(field, completeBlend(base.values[field])) : base;
    case 'enter': {
      if (field) return { ...base, focus: base.focus + 1 };
      const action = ACTIONS[base.focus - FIELDS.length];
      if (base.evaluation.error) return { ...base, message: `fix the design first: ${base.evaluation.error.message}` };
      if (action === 'start guided fill' && base.evaluation.preview?.danger) {
        return { ...base, request: action, message: 'danger findings stand: the guided fill will ask you to acknowledge them' };
      }
      return { ...base, request: action };
    }
    case 'done':
      return { ...base, message: a.message };
  }
}
