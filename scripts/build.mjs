// bundle the CLI into one ESM file: fast start (no thousand-module import graph)
import { build } from 'esbuild';
import { chmodSync, mkdirSync } from 'node:fs';

mkdirSync('dist', { recursive: true });
await build({
  entryPoints: ['src/cli/main.ts'],
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  outfile: 'dist/mixwright.mjs',
  jsx: 'automatic',
  alias: { 'react-devtools-core': './scripts/devtools-stub.mjs' },
  banner: {
    js: "#!/usr/bin/env node\nimport { createRequire as __mwCreateRequire } from 'node:module'; const require = __mwCreateRequire(import.meta.url);",
  },
  minify: true,
  sourcemap: 'linked',
  logLevel: 'warning',
});
chmodSync('dist/mixwright.mjs', 0o755);

// the Monte Carlo worker thread, loaded by the command from beside it
await build({
  entryPoints: ['src/io/mc-worker.ts'],
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  minify: true,
  outfile: 'dist/mc-worker.mjs',
  banner: { js: "import { createRequire as __mwCreateRequire } from 'node:module'; const require = __mwCreateRequire(import.meta.url);" },
  logLevel: 'warning',
});

// the re-check benchmark driver (not shipped)
await build({
  entryPoints: ['scripts/bench-check.ts'],
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  outfile: 'dist/bench-check.mjs',
  banner: { js: "import { createRequire as __mwCreateRequire } from 'node:module'; const require = __mwCreateRequire(import.meta.url);" },
  logLevel: 'warning',
});
