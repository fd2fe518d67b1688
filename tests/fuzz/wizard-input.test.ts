/**
 * The wizard's state machine under random keys: whatever is typed into whichever field, the
 * reducer and the live evaluation never throw (a throw in the key handler would end the
 * session and lose the design typed so far), and an action is requested only for a design
 * that evaluated without an error.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEFAULTS, wizardInit, wizardReducer, type WizardAction } from '../../src/tui/wizard-state.js';
import { makeEvaluator } from '../../src/tui/wizard-eval.js';

/** a property's time budget grows with FUZZ_RUNS (npm run fuzz runs 2000 on a shared machine) */
const FUZZ_BUDGET_MS = 30000 + Number(process.env.FUZZ_RUNS ?? 40) * 300;

const RUNS = Number(process.env.FUZZ_RUNS ?? 40);
const evaluate = makeEvaluator();

const text = fc.oneof(
  fc.constantFrom(
    'CH4',
    'C2H',
    'air',
    'O2:0.5,N2:0.5',
    'Ar:0.5,He:0.5',
    'XX',
    '0',
    '-1',
    '1e9',
    '0.5',
    '0.999',
    '1',
    '30 L',
    '1500 Torr',
    '22 degC',
    '-400 degC',
    'MT-2',
    'NaN',
    ':',
    ',',
    'y',
    'n',
  ),
  fc.string({ maxLength: 5 }),
);
const action: fc.Arbitrary<WizardAction[]> = fc.oneof(
  text.map((t) => [{ type: 'char', text: t }] as WizardAction[]),
  fc.constantFrom<WizardAction[]>(
    [{ type: 'backspace' }],
    [{ type: 'backspace' }, { type: 'backspace' }, { type: 'backspace' }],
    [{ type: 'up' }],
    [{ type: 'down' }],
    [{ type: 'complete' }],
    [{ type: 'enter' }],
    [{ type: 'escape' }],
  ),
);

describe('fuzz: wizard under random keys', () => {
  it(
    'no throw; a requested action always has an error-free evaluation',
    () => {
      fc.assert(
        fc.property(fc.array(action, { maxLength: 30 }), (chunks) => {
          let s = wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1' });
          for (const a of chunks.flat()) {
            s = wizardReducer(s, a, evaluate);
            if (s.request) {
              expect(s.evaluation.error, `requested ${s.request} on an invalid design`).toBeUndefined();
              // the shell asks first when the file exists, unless the user already said yes
              s = wizardReducer(
                s,
                s.replace
                  ? { type: 'done', message: 'ok' }
                  : {
                      type: 'result',
                      outcome: { kind: 'confirm', action: s.request, file: 'f', text: 'f exists; replace?' },
                    },
                evaluate,
              );
            }
            if (s.quit) s = { ...s, quit: undefined };
          }
        }),
        { numRuns: RUNS * 5 },
      );
    },
    FUZZ_BUDGET_MS,
  );
});
