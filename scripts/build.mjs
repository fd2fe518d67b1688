// bundle the CLI into one ESM file (fast start: no thousand-module import graph), plus its side files
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { chmodSync, mkdirSync, rmSync } from 'node:fs';

mkdirSync('dist', { recursive: true });
// the former single-file command and its map (the loader and dist/cli.cjs replace them)
rmSync('dist/mixwright.mjs.map', { force: true });

// what every bundle shares: one ESM file for Node 20 that can still require() CommonJS dependencies
const REQUIRE_BANNER =
  "import { createRequire as __mwCreateRequire } from 'node:module'; const require = __mwCreateRequire(import.meta.url);";
const base = {
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  logLevel: 'warning',
  banner: { js: REQUIRE_BANNER },
};

// the interactive screens (ink, react) live in their own bundle, loaded only by `fill` and the wizard
const tuiExternal = {
  name: 'tui-external',
  setup(b) {
    b.onResolve({ filter: /tui\/run\.js$/ }, () => ({ path: './tui.mjs', external: true }));
  },
};
await build({
  entryPoints: ['src/tui/run.tsx'],
  ...base,
  minify: true,
  outfile: 'dist/tui.mjs',
  jsx: 'automatic',
  alias: { 'react-devtools-core': './scripts/devtools-stub.mjs' },
  define: { 'process.env.NODE_ENV': '"production"' },
});

// mathjs in its own CommonJS file, required on first use only (units outside the fast table)
await build({
  entryPoints: ['src/io/mathjs-instance.ts'],
  ...base,
  format: 'cjs',
  banner: {},
  minify: true,
  outfile: 'dist/units.cjs',
});
const lazyMath = {
  name: 'lazy-mathjs',
  setup(b) {
    b.onResolve({ filter: /mathjs-instance\.js$/ }, () => ({ path: 'lazy-mathjs', namespace: 'lazy' }));
    b.onLoad({ filter: /.*/, namespace: 'lazy' }, () => ({
      contents:
        "import { createRequire } from 'node:module'; const req = createRequire(import.meta.url); export function createMath() { return req('./units.cjs').createMath(); }",
      loader: 'js',
      resolveDir: '.',
    }));
  },
};

// commander loads child_process at start-up for executable subcommands, which mixwright has none
// of: the bundle gets it on first use instead (loading it costs every command milliseconds)
const lazyChildProcess = {
  name: 'lazy-child-process',
  setup(b) {
    b.onLoad({ filter: /commander[\\/]lib[\\/]command\.js$/ }, async (args) => {
      const { readFile } = await import('node:fs/promises');
      const text = await readFile(args.path, 'utf8');
      const eager = "const childProcess = require('node:child_process');";
      if (!text.includes(eager)) throw new Error(`commander changed: "${eager}" not found in ${args.path}`);
      const lazy = "const childProcess = { get spawn() { return require('node:child_process').spawn; } };";
      return { contents: text.replace(eager, lazy), loader: 'js' };
    });
  },
};

// the commands: one CommonJS function body (dist/cli.cjs) that the command's loader compiles with
// V8's code cache (scripts/cli-load.mjs); import.meta.url is the loader's argument
await build({
  plugins: [tuiExternal, lazyMath, lazyChildProcess],
  entryPoints: ['src/cli/start.ts'],
  ...base,
  format: 'cjs',
  banner: {},
  define: { 'import.meta.url': '__mwMetaUrl' },
  outfile: 'dist/cli.cjs',
  jsx: 'automatic',
  alias: { 'react-devtools-core': './scripts/devtools-stub.mjs' },
  minify: true,
  sourcemap: 'linked',
});
// the command itself: the loader
await build({
  entryPoints: ['scripts/cli-bin.mjs'],
  ...base,
  banner: { js: '#!/usr/bin/env node' },
  outfile: 'dist/mixwright.mjs',
  minify: true,
});
chmodSync('dist/mixwright.mjs', 0o755);
// the code cache: typical commands run once on the new bundle (scripts/code-cache.mjs)
{
  const r = spawnSync(process.execPath, ['scripts/code-cache.mjs'], {
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  if (r.status !== 0) throw new Error(`the code cache was not made (exit ${r.status})`);
}

// the Monte Carlo worker thread, loaded by the command from beside it
await build({
  entryPoints: ['src/io/mc-worker.ts'],
  ...base,
  minify: true,
  outfile: 'dist/mc-worker.mjs',
});

// the re-check benchmark driver (not shipped)
await build({
  entryPoints: ['scripts/bench-check.ts'],
  ...base,
  outfile: 'dist/bench-check.mjs',
});

// the accuracy record (npm run accuracy; not shipped)
await build({
  entryPoints: ['scripts/accuracy.ts'],
  ...base,
  outfile: 'dist/accuracy.mjs',
});
