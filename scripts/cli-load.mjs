// Loading the command bundle (dist/cli.cjs) with V8's code cache made at build time
// (dist/cli.cjs.cache, scripts/code-cache.mjs): the bytecode of the functions a typical run
// needs is read instead of compiled. Shared by the command's loader (scripts/cli-bin.mjs, bundled
// into dist/mixwright.mjs) and the build's code-cache run, so both compile the bundle the same way.
//
// The cache is used only when its header matches: a hash of the bundle's text and of this Node's
// version, architecture and V8 version, and a hash of the cache's own bytes. Anything else (no
// cache, a stale or damaged one, another Node) compiles the bundle as if there were no cache, as
// does V8 itself when it rejects the data (other flags); the result is the same either way.
import { Buffer } from 'node:buffer';
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname } from 'node:path';
import { fileURLToPath, pathToFileURL, URL } from 'node:url';
import vm from 'node:vm';

export const BUNDLE = 'cli.cjs';
export const CACHE = 'cli.cjs.cache';
const HASH = 'sha1';
const HEX = 40;

// the bundle runs as a CommonJS function body; import.meta.url is a parameter (esbuild's define)
const HEAD = '(function (exports, require, module, __filename, __dirname, __mwMetaUrl) {';
const TAIL = '\n})';

/** the cache key: the bundle's text and the engine that may use the cache */
function keyOf(source) {
  return createHash(HASH)
    .update(source)
    .update(`\0${process.version}\0${process.arch}\0${process.versions.v8}`)
    .digest('hex');
}

/** the cached bytes, only when the header names this bundle and engine and the bytes are whole */
function readCache(file, key) {
  let buf;
  try {
    buf = readFileSync(file);
  } catch {
    return undefined;
  }
  if (buf.length <= 2 * HEX || buf.toString('latin1', 0, HEX) !== key) return undefined;
  const data = buf.subarray(2 * HEX);
  const sum = createHash(HASH).update(data).digest('hex');
  return buf.toString('latin1', HEX, 2 * HEX) === sum ? data : undefined;
}

/** write the cache for `source` beside the bundle */
export function writeCache(dir, source, data) {
  const sum = createHash(HASH).update(data).digest('hex');
  writeFileSync(
    fileURLToPath(new URL(CACHE, dir)),
    Buffer.concat([Buffer.from(keyOf(source) + sum, 'latin1'), data]),
  );
}

/**
 * Compile and run the bundle in `dir` (a file URL ending in /); `useCache` false ignores any cache.
 * Returns its exports, the compiled script (for createCachedData), its text and whether a cache was used.
 */
export function loadBundle(dir, useCache = true) {
  const file = fileURLToPath(new URL(BUNDLE, dir));
  const source = readFileSync(file, 'utf8');
  const cachedData = useCache ? readCache(`${file}.cache`, keyOf(source)) : undefined;
  const script = new vm.Script(HEAD + source + TAIL, {
    filename: file,
    cachedData,
    // import() inside the bundle (the terminal screens, dist/tui.mjs) resolves beside it as in a module
    importModuleDynamically: vm.constants.USE_MAIN_CONTEXT_DEFAULT_LOADER,
  });
  const module = { exports: {} };
  script.runInThisContext()(
    module.exports,
    createRequire(file),
    module,
    file,
    dirname(file),
    pathToFileURL(file).href,
  );
  return { exports: module.exports, script, source, cached: !!cachedData && !script.cachedDataRejected };
}
