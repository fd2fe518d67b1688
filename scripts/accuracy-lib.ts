// The accuracy record: the planner's real-gas targets against readings from a reference
// mixture equation of state (tests/fixtures/reference/accuracy-grid-coolprop.json), beside
// the ideal-gas plan's error. Used by scripts/accuracy.ts (prints and writes docs/accuracy-record.json)
// and by tests/core/accuracy.test.ts (checks the committed record).
import { designMixture, planFill, pureCylinder, virialModel } from '../src/core/index.js';
import crossTable from '../src/core/data/cross-virial-reference.json' with { type: 'json' };

export interface GridCase {
  id: string;
  design: string;
  bath: string;
  composition: Record<string, number>;
  order: string[];
  temperature_K: number;
  final_pressure_Pa: number;
  readings: { species: string; pressure_Pa: number }[];
}

export interface RecordRow {
  id: string;
  bath: string;
  temperature_K: number;
  final_bar: number;
  /** largest |target - reference| / reference over the fills */
  model_error: number;
  /** the same for the ideal-gas plan (P_f x cumulative fraction) */
  ideal_error: number;
  /**
   * pairs of the case (both at 1 % or more) whose cross coefficients the model does not take from the
   * reference mixture model, and why: there the record compares two estimates, not model and data
   */
  pairs_not_from_reference: string[];
}

const leftOut = crossTable.left_out as Record<string, { kind: 'unfitted' | 'not-virial' }>;

function pairsNotFromReference(c: GridCase): string[] {
  const keys = Object.keys(c.composition).filter((k) => c.composition[k] >= 0.01);
  const m = virialModel(keys, c.temperature_K);
  return m.entries
    .filter((e) => e.i !== e.j && e.method === 'combining-rule')
    .map((e) => {
      const why = leftOut[`${e.i}|${e.j}`] ?? leftOut[`${e.j}|${e.i}`];
      const reason = !why ? 'no binary model in the library' : why.kind === 'unfitted' ? 'unfitted in the library' : 'library model not virial-consistent';
      return `${e.i}-${e.j}: ${reason}`;
    });
}

export function accuracyRows(cases: readonly GridCase[]): RecordRow[] {
  return cases.map((c) => {
    const plan = planFill({
      design: designMixture({ kind: 'fractions', fractions: c.composition }),
      finalPressurePa: c.final_pressure_Pa,
      temperatureK: c.temperature_K,
      tank: { id: 'T', label: 'T', volumeM3: 0.01 },
      sources: c.order.map((s) => pureCylinder({ id: s, species: s, purity: 1 })),
      order: 'given',
      gauges: [],
      reading: { barometricPa: 101325, barometricUncertaintyPa: 50 },
      tolerance: { relative: 0.005, absolute: 0 },
    });
    let model = 0;
    let ideal = 0;
    plan.steps.forEach((s, i) => {
      const ref = c.readings[i].pressure_Pa;
      model = Math.max(model, Math.abs(s.targetPa / ref - 1));
      ideal = Math.max(ideal, Math.abs(s.idealTargetPa / ref - 1));
    });
    const round = (x: number) => Number(x.toPrecision(6));
    return {
      id: c.id,
      bath: c.bath,
      temperature_K: c.temperature_K,
      final_bar: c.final_pressure_Pa / 1e5,
      model_error: round(model),
      ideal_error: round(ideal),
      pairs_not_from_reference: pairsNotFromReference(c),
    };
  });
}

/** one tenth of a 0.12 %-of-reading gauge */
export const TARGET = 1.2e-4;
