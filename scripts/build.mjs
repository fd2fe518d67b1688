// bundle the CLI into one ESM file (fast start: no thousand-module import graph), plus its side files
import { build } from 'esbuild';
import { chmodSync, mkdirSync } from 'node:fs';

mkdirSync('dist', { recursive: true });

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

await build({
  plugins: [tuiExternal, lazyMath],
  entryPoints: ['src/cli/main.ts'],
  ...base,
  outfile: 'dist/mixwright.mjs',
  jsx: 'automatic',
  alias: { 'react-devtools-core': './scripts/devtools-stub.mjs' },
  banner: { js: `#!/usr/bin/env node\n${REQUIRE_BANNER}` },
  minify: true,
  sourcemap: 'linked',
});
chmodSync('dist/mixwright.mjs', 0o755);

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
