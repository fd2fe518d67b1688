import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { defineConfig, type TestProjectConfiguration } from 'vitest/config';

/**
 * `npm test` runs every test file isolated. `npm run test:quick` (MIXWRIGHT_QUICK=1) runs the core,
 * io and architecture tests with the modules shared between the files of a worker (isolate: false),
 * which spares most of each file's start-up; the files that mock a module (vi.mock) still run
 * isolated, found by reading the files, as a mock must not leak into other files.
 */
const QUICK_DIRS = ['tests/core', 'tests/io'];
/** files that need a fresh module graph besides those that mock: startup asserts mathjs was never built */
const FRESH_MODULES = ['tests/io/startup.test.ts'];

function testFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const path = join(dir, e.name);
    if (e.isDirectory()) return testFiles(path);
    return /\.test\.tsx?$/.test(e.name) ? [path] : [];
  });
}

function quickProjects(): TestProjectConfiguration[] {
  const files = [...QUICK_DIRS.flatMap(testFiles), 'tests/architecture.test.ts'];
  const mocking = files.filter(
    (f) => FRESH_MODULES.includes(f) || readFileSync(f, 'utf8').includes('vi.mock('),
  );
  return [
    { extends: true, test: { name: 'quick-isolated', include: mocking } },
    { extends: true, test: { name: 'quick-shared', include: files, exclude: mocking, isolate: false } },
  ];
}

// (a project that extends the root config adds to its include list: the quick run sets none at the root)
export default defineConfig({
  test: {
    environment: 'node',
    testTimeout: 30000,
    ...(process.env.MIXWRIGHT_QUICK === '1'
      ? { projects: quickProjects() }
      : { include: ['tests/**/*.test.{ts,tsx}'] }),
  },
});
