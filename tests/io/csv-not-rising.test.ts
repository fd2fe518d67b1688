// A reading not above the row before names the likely cause and what to do. Either row may be the wrong
// one: the row before (past its gauge's range or the tank's working limit, or its number in this row's
// unit would rise: "1480.02 kPa" for Torr) or the offending row itself (its number in the row before's
// unit would rise: "1500.0 Pa" for Torr); the one with more against it is named, both where they weigh
// the same, neither when nothing points at one.
// The pressures in the words are unit conversions: 1 Torr = 101325/760 Pa exactly (the definition), and
// 1480.02 kPa = 11101.1 Torr to the 6 digits shown (by hand: 1480020 / 133.3224 = 11101.08);
// 1500.0 Pa = 11.2509 Torr (by hand: 1500 / 133.3224 = 11.25092).
import { describe, expect, it } from 'vitest';
import { parseReadingsCsv, type CsvContext } from '../../src/io/readings-csv.js';
import { describeProblem, ProblemError } from '../../src/core/index.js';

const TORR = 101325 / 760;
const H = 'species,pressure,temperature,gauge\n';
const CTX: CsvContext = {
  fullScaleOf: (id) => (id === 'head-10kT' ? 10000 * TORR : undefined),
  tank: { id: 'MT-1', limitPa: 2700 * TORR },
};

function refusal(text: string, ctx: CsvContext = CTX): { line?: number; words: string } {
  try {
    parseReadingsCsv(text, 'r.csv', ctx);
  } catch (e) {
    if (!(e instanceof ProblemError)) throw e;
    expect(e.problem.code).toBe('csv-not-rising');
    return { line: e.where?.line, words: describeProblem(e.problem) };
  }
  throw new Error('the rows were not refused');
}

describe('csv-not-rising: the likely cause', () => {
  it('a kPa typed for Torr on the row before: that row, past the gauge range and the working limit, is named', () => {
    const r = refusal(
      H +
        'CH4,10.0126 Torr,25 degC,head-1kT\nAr,1480.02 kPa,25 degC,head-10kT\nO2,1500.0 Torr,25 degC,head-10kT\n',
    );
    expect(r.line).toBe(4);
    expect(r.words).toContain('(line 3: 1480.02 kPa, 11101.1 Torr)');
    expect(r.words).toContain("Likely cause: line 3's value or unit (1480.02 kPa)");
    expect(r.words).toContain('past the range of head-10kT (10000.0 Torr)');
    expect(r.words).toContain("tank MT-1's working limit (2700.00 Torr)");
    expect(r.words).toContain('read as 1480.02 Torr, like line 4, it would rise in order');
    expect(r.words).toContain('Correct line 3 from the paper record');
  });

  it('without gauges or tank known, the unit alone points at the row before', () => {
    const r = refusal(H + 'CH4,10 Torr,25 degC,\nAr,1480.02 kPa,25 degC,\nO2,1500 Torr,25 degC,\n', {});
    expect(r.words).toContain("Likely cause: line 3's value or unit (1480.02 kPa): read as 1480.02 Torr");
    expect(r.words).not.toContain('past the range');
  });

  it('the offending row itself in a wrong unit (Pa for Torr): that row is named, not the one before', () => {
    const r = refusal(
      H +
        'CH4,10.0126 Torr,25 degC,head-1kT\nO2,30.03 Torr,25 degC,head-1kT\nAr,1500.0 Pa,25 degC,head-10kT\n',
    );
    expect(r.line).toBe(4);
    // the two compared in one unit
    expect(r.words).toContain(
      'the reading 1500.0 Pa (11.2509 Torr) is not above the previous one (line 3: 30.03 Torr)',
    );
    expect(r.words).toContain(
      "Likely cause: line 4's value or unit (1500.0 Pa): read as 1500.0 Torr, like line 3, it would rise " +
        'in order; the rows before are in Torr, not Pa. Correct line 4 from the paper record',
    );
    expect(r.words).not.toMatch(/line 3's value/);
  });

  it("a reading of the offending row in the row before's unit past the tank's limit does not point at it", () => {
    // 1500 kPa would rise above 1480.02 kPa, but it is past the working limit: line 3 alone is named
    const r = refusal(H + 'Ar,1480.02 kPa,25 degC,\nO2,1500 Torr,25 degC,\n');
    expect(r.words).toContain("Likely cause: line 2's value or unit (1480.02 kPa)");
    expect(r.words).not.toMatch(/line 3's value/);
  });

  it("both rows pointed at equally (two rows, each rising in the other's unit, no limit known): both named", () => {
    const r = refusal(H + 'Ar,1480.02 kPa,25 degC,\nO2,1500 Torr,25 degC,\n', {});
    expect(r.words).toContain(
      "Likely cause, one of the two: line 2's value or unit (1480.02 kPa): read as 1480.02 Torr, like " +
        "line 3, it would rise in order; or line 3's value or unit (1500 Torr): read as 1500 kPa, like " +
        'line 2, it would rise in order. Correct the wrong one from the paper record',
    );
  });

  it('rows in the same unit, nothing past a limit: either row may be wrong, never a guess', () => {
    const r = refusal(H + 'CH4,10 Torr,25 degC,\nAr,1400 Torr,25 degC,\nO2,1300 Torr,25 degC,\n');
    expect(r.words).toContain('(line 3: 1400 Torr)');
    expect(r.words).not.toContain('Likely cause');
    expect(r.words).toContain(
      'Either line 3 or line 4 has a wrong value or unit, or the rows are not in fill order',
    );
  });
});
