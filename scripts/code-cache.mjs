// Build step: run typical commands once in this process on the freshly built bundle (output
// discarded) and write V8's code cache of every function they compiled (dist/cli.cjs.cache).
// Nothing of a command's result is kept: the cache holds compiled bytecode only, keyed to the
// bundle's text and this Node (scripts/cli-load.mjs), so a run's output never depends on it.
import { URL } from 'node:url';
import { loadBundle, writeCache } from './cli-load.mjs';

const dist = new URL('../dist/', import.meta.url);
const DEMO = 'recipes/ch4-o2-ar-phi1.yaml';
const RUNS = [
  ['--help'],
  ['plan', DEMO],
  [
    'plan',
    '--fuel',
    'CH4:0.5,H2:0.5',
    '--oxidizer',
    'O2',
    '--phi',
    '0.5',
    '--diluent',
    'Ar:0.5,He:0.5',
  ].concat([
    '--dilution',
    '0.9',
    '--tank',
    'MT-2',
    '--pressure',
    '1500 Torr',
    '--temperature',
    '22 degC',
    '--json',
  ]),
  ['sheet', DEMO, '--format', 'md', '--batch', 'code-cache'],
  ['check', 'batches/demo-ch4-phi1-ar98.jsonl', '--trials', '100000'],
];

const { exports, script, bundle } = loadBundle(dist, false);
const sink = { write: () => true };
for (const argv of RUNS) {
  const { run } = exports.createProgram({ stdout: sink, stderr: sink, isTTY: false });
  const code = await run(argv);
  // a run that fails here means the bundle is broken: stop the build
  if (code === 1 || code === 2) throw new Error(`code-cache run ${argv.join(' ')} exited ${code}`);
}
writeCache(dist, bundle, script.createCachedData());
