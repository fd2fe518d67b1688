import { describe, expect, it } from 'vitest';
import { designOptions, runCli, fixture, STACK_LINE, TORR, type DesignChange } from '../helpers.js';

const worked = fixture('worked-plan.json');
/** the plan command of the inline CH4/O2/Ar design, filled in the order CH4, O2, Ar, with any option changed */
const inline = (change: DesignChange = {}) => ['plan', ...designOptions({ order: 'CH4,O2,Ar', ...change })];
const INLINE = inline();

describe('mixwright plan', () => {
  it('plans a demo recipe: exit 0, the real-gas targets, the caution', async () => {
    const r = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).toContain('Fill plan  ch4-phi1-ar98');
    expect(r.stdout).toMatch(/1\s+CH4\s+cyl-CH4\s+head-1kT\s+10\.01 Torr/);
    // the sequence search's choice: the Ar split so that O2 is read on the 1000 Torr head
    expect(r.stdout).toContain(
      'CH4 -> Ar 1/2 -> O2 -> Ar 2/2  (recommended: this sequence has the smallest predicted U (k = 2) of the',
    );
    expect(r.stdout).toMatch(/every intermediate tank state and every fill path is non-flammable/);
    expect(r.stdout).toContain('Caution: This plan is an engineering estimate');
    // cross coefficients: all three pairs are in the reference mixture-model table (CoolProp 8.0.0:
    // Kunz-JCED-2012 for CH4-O2 and CH4-Ar, Gernert-Thesis-2013 for O2-Ar); B_mix as printed in --json
    expect(r.stdout).toMatch(
      /Real gas\s+B_mix -15\.\d\d cm3\/mol; cross B from reference mixture models: CH4-O2, CH4-Ar, O2-Ar\n/,
    );
  });

  it('names the pairs left to the combining rule: He-Ar and He-O2, which no library model gives as one virial coefficient', async () => {
    const r = await runCli([
      'plan',
      '--fractions',
      'CH4:0.01,O2:0.02,He:0.30,Ar:0.67',
      '--volume',
      '10 L',
      '--pressure',
      '1000 Torr',
      '--temperature',
      '298.15 K',
    ]);
    expect(r.stdout).toMatch(/Real gas .*cross B from reference mixture models: [^;]*CH4-O2/);
    expect(r.stdout).toMatch(/by combining rule: CH4-He, O2-He, Ar-He\n/);
  });

  it('inline options, --json: the BRIEF contract keys, targets of the worked vector (properties.md 1.2) within 0.01 Torr with the demo cylinders', async () => {
    const r = await runCli([...INLINE, '--json']);
    // the given order CH4, O2, Ar passes through an undiluted CH4/O2 state: planned, exit 3
    expect(r.code).toBe(3);
    const j = JSON.parse(r.stdout);
    expect(Object.keys(j.mixture.composition).sort()).toEqual(['Ar', 'CH4', 'O2']);
    expect(j.mixture.phi).toBeCloseTo(1, 12);
    expect(j.final.pressure_Pa).toBeCloseTo(1000 * TORR, 6);
    expect(j.final.temperature_K).toBe(298.15);
    expect(j.final.compressibility).toBeGreaterThan(0.999);
    expect(j.final.amount_mol).toBeGreaterThan(0.538);
    expect(j.steps.map((s: { species: string }) => s.species)).toEqual(['CH4', 'O2', 'Ar']);
    j.steps.forEach(
      (s: { target_Pa: number; increment_Pa: number; amount_mol: number; gauge: string }, i: number) => {
        expect(Math.abs(s.target_Pa / TORR - worked.targets_Torr[i])).toBeLessThan(0.01);
        expect(s.increment_Pa).toBeGreaterThan(0);
        expect(s.amount_mol).toBeGreaterThan(0);
        expect(typeof s.gauge).toBe('string');
      },
    );
    for (const f of j.findings) {
      expect(['danger', 'warning', 'note']).toContain(f.severity);
      expect(typeof f.code).toBe('string');
      expect(typeof f.message).toBe('string');
    }
  });

  it('--units bar shows the table in bar; the recipe unit is the default', async () => {
    const r = await runCli(['plan', 'recipes/ng-blend-air.yaml', '--pressure', '0.6 bar']);
    expect(r.stdout).toContain('target bar abs');
    const t = await runCli([...INLINE, '--units', 'kPa']);
    expect(t.stdout).toContain('target kPa abs');
  });

  it('a final pressure above the tank working limit plans but exits 3 (danger finding)', async () => {
    const r = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--pressure', '3.8 bar']);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain('tank-over-rating');
    // the experiment count holds only for a plan that can be filled safely
    const dangers = (r.stdout.match(/^ {2}DANGER /gm) ?? []).length;
    expect(dangers).toBeGreaterThan(0);
    expect(r.stdout).toMatch(
      new RegExp(`^Serves .*; only once the ${dangers} DANGER findings? below (are|is) resolved$`, 'm'),
    );
    const ok = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml']);
    expect(ok.stdout).toMatch(/^Serves /m);
    expect(ok.stdout).not.toMatch(/only once/);
  });
});

describe('bad input: exit 2, one message naming what and where, never a stack trace', () => {
  const cases: [string, string[], string, RegExp][] = [
    [
      'unknown species, with suggestions',
      inline({ fuel: 'CH5' }),
      'unknown-species',
      /--fuel: unknown species "CH5"; did you mean CH4/,
    ],
    [
      'phi <= 0 on the command line',
      inline({ phi: '-1' }),
      'not-positive',
      /--phi: phi \(equivalence ratio\) must be greater than zero/,
    ],
    [
      'dilution 1',
      inline({ dilution: '1' }),
      'out-of-range',
      /--dilution: dilution .* outside the allowed range \[0, 1\)/,
    ],
    [
      'a volume given as the pressure',
      inline({ pressure: '30 L' }),
      'wrong-dimension',
      /--pressure: "30 L" is a volume, but a pressure is needed/,
    ],
    [
      'a pressure without a unit',
      inline({ pressure: '1000' }),
      'bad-quantity',
      /--pressure: cannot read "1000" as a pressure: a unit is required/,
    ],
    [
      'negative volume',
      inline({ volume: '-10 L' }),
      'not-positive',
      /--volume: tank volume must be greater than zero/,
    ],
    [
      'zero pressure',
      inline({ pressure: '0 Torr' }),
      'not-positive',
      /--pressure: final pressure must be greater than zero/,
    ],
    [
      'an order that misses a gas',
      inline({ order: 'CH4,O2' }),
      'order-missing',
      /--order: the fill order leaves out Ar/,
    ],
    [
      'an order that repeats a gas with a stop on its last charge (a gas named again is another charge)',
      inline({ order: 'CH4,O2,Ar,O2@900 Torr' }),
      'order-stop',
      /--order: the fill order entry "O2@900 Torr" gives a stop on the last charge of O2 \(charge 2 of 2\)/,
    ],
    [
      'an order with a gas the mixture does not fill',
      inline({ order: 'CH4,O2,He' }),
      'order-unknown',
      /--order: the fill order names He/,
    ],
    [
      'a recipe with an unknown key: file, line and the allowed keys',
      ['plan', 'tests/cli/bad/unknown-key.yaml'],
      'unknown-key',
      /unknown-key\.yaml:9:3 mixture\.dilutoin_ratio: unknown key "dilutoin_ratio"; allowed here: .*diluent_ratio/,
    ],
    [
      'a YAML syntax error, with its line',
      ['plan', 'tests/cli/bad/syntax.yaml'],
      'yaml-syntax',
      /syntax\.yaml:\d+:\d+: not valid YAML/,
    ],
    [
      'a map used as a key, with its line and no parser warning',
      ['plan', 'tests/cli/bad/collection-key.yaml'],
      'yaml-syntax',
      /collection-key\.yaml:4:3: not valid YAML: a key is a list or map/,
    ],
    [
      'a volume where the recipe wants a pressure',
      ['plan', 'tests/cli/bad/volume-as-pressure.yaml'],
      'wrong-dimension',
      /volume-as-pressure\.yaml:4:11 pressure: "30 L" is a volume/,
    ],
    [
      'phi 0 in a recipe, with its line',
      ['plan', 'tests/cli/bad/phi-zero.yaml'],
      'not-positive',
      /phi-zero\.yaml:7:8 mixture\.phi: phi/,
    ],
    [
      'a missing recipe file',
      ['plan', 'tests/cli/bad/nope.yaml'],
      'file-unreadable',
      /nope\.yaml: cannot read the file: no such file/,
    ],
    [
      'an unknown tank',
      ['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--tank', 'MT-9'],
      'unknown-reference',
      /--tank: no tank "MT-9" in the lab profile; it lists MT-1, MT-2/,
    ],
    [
      'fractions that do not sum to 1',
      [
        'plan',
        '--fractions',
        'CH4:0.05,O2:0.1,Ar:0.8',
        '--volume',
        '10 L',
        '--pressure',
        '1 bar',
        '--temperature',
        '20 degC',
      ],
      'fractions-sum',
      /--fractions: the mole fractions add up to 0\.950000/,
    ],
    [
      'options missing without a recipe',
      ['plan', '--fuel', 'CH4'],
      'options-missing',
      /give a recipe file, or on the command line: --fuel, --oxidizer and --phi/,
    ],
    [
      'a lab profile that does not exist',
      [...INLINE, '--lab', 'nowhere.yaml'],
      'file-unreadable',
      /nowhere\.yaml: cannot read the file/,
    ],
  ];
  for (const [what, argv, code, message] of cases) {
    it(what, async () => {
      const r = await runCli(argv);
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr).toContain(`(error code: ${code})`);
      expect(r.stderr).toMatch(message);
      expect(r.stderrShown).not.toMatch(STACK_LINE);
      expect(r.stderr).not.toMatch(/Warning:/);
      expect(r.stdout).toBe('');
    });
  }

  it('an unknown option is a usage error, exit 2', async () => {
    const r = await runCli(['plan', '--fuell', 'CH4']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("unknown option '--fuell'");
  });
});

describe('other commands', () => {
  it('bare mixwright outside a terminal: a short message, exit 2', async () => {
    const r = await runCli([]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('not a terminal');
  });

  it('species CH4 lists each property with its source; unknown names suggest', async () => {
    const r = await runCli(['species', 'CH4']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/critical temperature\s+190\.564\s+K\s+refprop-heos-constants/);
    expect(r.stdout).toMatch(/molar mass\s+16\.043\s+g\/mol\s+iupac-2021/);
    expect(r.stdout).toMatch(
      /second virial coefficient at 298\.15 K\s+-42\.91\d\s+cm3\/mol\s+coolprop-8-virial/,
    );
    expect(r.stdout).toMatch(/LFL in air\s+4\.40\s+vol %\s+iec-60079-20-1-2010/);
    // the pair table (CoolProp 8.0.0 mixture models that qualify, data/cross-virial-reference.json)
    expect(r.stdout).toContain(
      'from reference mixture models (coolprop-8-mixture, 230-480 K) with: Ar, Kr, N2, O2, CO, C2H6 (B only), C2H4.',
    );
    expect((await runCli(['species', 'He'])).stdout).toContain(
      'Cross virial coefficients with every other species: Prausnitz combining rules (prausnitz-1999); no reference mixture model qualifies',
    );
    const all = await runCli(['species']);
    expect(all.stdout.split('\n').filter((l) => /^\S/.test(l)).length).toBeGreaterThan(31);
    const bad = await runCli(['species', 'methan']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('did you mean CH4');
  });

  it('schema recipe and schema lab print JSON Schemas that name the fields', async () => {
    const r = await runCli(['schema', 'recipe']);
    expect(r.code).toBe(0);
    const s = JSON.parse(r.stdout);
    expect(Object.keys(s.properties)).toEqual(
      expect.arrayContaining(['id', 'tank', 'mixture', 'pressure', 'temperature', 'order']),
    );
    const l = JSON.parse((await runCli(['schema', 'lab'])).stdout);
    expect(Object.keys(l.properties)).toEqual(
      expect.arrayContaining(['tanks', 'gauges', 'cylinders', 'barometer']),
    );
    expect((await runCli(['schema', 'sheet'])).code).toBe(2);
  });

  it('--help texts are pinned', async () => {
    const top = await runCli(['--help']);
    expect(top.code).toBe(0);
    expect(top.stdout).toMatchSnapshot();
    const plan = await runCli(['plan', '--help']);
    expect(plan.stdout).toMatchSnapshot();
  });
});

describe('sizing and readiness', () => {
  it('plan states how many experiments the batch serves for the lab reactor; --experiments sizes the final pressure', async () => {
    const r = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--json']);
    const j = JSON.parse(r.stdout);
    expect(j.experiments.reactor).toBe('ST-A');
    expect(j.experiments.count).toBeGreaterThan(0);
    const s = await runCli([
      'plan',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--experiments',
      '40',
      '--reactor-volume',
      '0.9 L',
      '--fill-pressure',
      '50 Torr',
      '--json',
    ]);
    const k = JSON.parse(s.stdout);
    expect(k.experiments.count).toBe(40);
    expect(k.experiments.sized_for).toBe(40);
    // 40 x 0.9 L x 50 Torr / 10 L + 55 Torr reserve = 235 Torr (ideal gas; real within 0.1 %)
    expect(Math.abs(k.final.pressure_Pa / TORR / 235 - 1)).toBeLessThan(1e-3);
  });
  it('ready: diffusion mixing time and contamination, with the tank data of the lab profile', async () => {
    const r = await runCli([
      'ready',
      'recipes/ng-blend-air.yaml',
      '--leak',
      '2e-5 Torr/min',
      '--days',
      '30',
      '--json',
    ]);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.mixing.diffusion_to_1pct_s).toBeGreaterThan(0);
    expect(j.mixing.diffusion_to_0_1pct_s / j.mixing.diffusion_to_1pct_s).toBeCloseTo(1.5, 9);
    expect(j.contamination.phi_after).toBeLessThan(j.contamination.phi_start);
    const bad = await runCli(['ready', 'recipes/ng-blend-air.yaml', '--height', '2 L']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('is a volume, but a length is needed');
  });
});

describe('interactive commands outside a terminal', () => {
  it('fill and wizard exit 2 with a pointer to plan, sheet and check', async () => {
    const f = await runCli(['fill', 'recipes/ch4-o2-ar-phi1.yaml']);
    expect(f.code).toBe(2);
    expect(f.stderr).toContain('needs a terminal');
    expect(f.stderr).toContain('mixwright check');
    const w = await runCli(['wizard']);
    expect(w.code).toBe(2);
    expect(w.stderr).toContain('mixwright sheet');
  });
});
