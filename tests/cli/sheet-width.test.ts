// The text fill sheet fits an 80-column terminal or page: its prose wrapped by the one wrapper
// (report/wrap.ts), the Fills table kept to what is read (the blanks to write in on the line under each
// row, a band said in words under its row). On every demo recipe, a tank over its rating (bands finer than
// the display), a split-charge plan, a two-stage plan (both stages) and a premix log. Layout only: no
// computed number is checked here.
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

const CASES: [string, string[]][] = [
  ['ch4', ['recipes/ch4-o2-ar-phi1.yaml']],
  ['c2h4', ['recipes/c2h4-o2-ar-phi05.yaml']],
  ['n-heptane', ['recipes/nc7h16-o2-ar.yaml']],
  ['natural gas in air', ['recipes/ng-blend-air.yaml']],
  ['natural gas, O2 onto the fuel', ['recipes/ng-blend-air.yaml', '--order', 'CH4,C2H6,O2,N2']],
  ['over the rating', ['recipes/ch4-o2-ar-phi1.yaml', '--pressure', '3000 Torr']],
  ['split charges', ['recipes/ch4-o2-ar-phi1.yaml', '--order', 'CH4,Ar@400 Torr,O2,Ar']],
  ['two-stage', ['recipes/ch4-o2-ar-phi1.yaml', '--premix-tank', 'MT-2']],
  ['premix log', ['recipes/ch4-o2-ar-phi1.yaml', '--premix-log', 'batches/demo-premix-o2-ar-mt2.jsonl']],
  // band-edges-past-tolerance: the shared band as a column of the Fills table
  ['shared band', ['recipes/ch4-o2-ar-phi1.yaml', '--tolerance', '0.015']],
  [
    'shared band, split charges',
    ['recipes/ch4-o2-ar-phi1.yaml', '--tolerance', '0.02', '--order', 'CH4,Ar@400 Torr,O2,Ar'],
  ],
];

describe('the text sheet fits 80 columns', () => {
  it.each(CASES)('%s', async (_name, args) => {
    const r = await runCli(['sheet', ...args, '--format', 'txt', '--batch', 'w1']);
    expect(r.stderr).toBe('');
    const lines = r.stdout.split('\n');
    expect(lines.filter((l) => l.length > 80)).toEqual([]);
    // the blanks to write in follow every fill row (and the premix tank's check row)
    const fills = lines.filter((l) => /^ {2}\d+ {2}/.test(l) || /^ {5}check /.test(l));
    expect(fills.length).toBeGreaterThan(1);
    const blanks = lines.filter((l) => l === '     actual __________   time _____   init ____   done [ ]');
    expect(blanks).toHaveLength(fills.length);
    // nothing is lost to the width: each finding's code is printed
    expect(r.stdout).toMatch(/^FINDINGS$/m);
  });
});
