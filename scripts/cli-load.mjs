// Loading the command bundle (dist/cli.cjs) with V8's code cache made at build time
// (dist/cli.cjs.cache, scripts/code-cache.mjs): the bytecode of the functions a typical run
// needs is read instead of compiled. Shared by the command's loader (scripts/cli-bin.mjs, bundled
// into dist/mixwright.mjs) and the build's code-cache run, so both compile the bundle the same way.
//
// The cache is used only when its header matches: a CRC-32 of the bundle's bytes, this Node's
// version, architecture and V8 version, and a CRC-32 of the cache's own bytes (a damaged or cut
// cache is never handed to V8). Anything else (no cache, a stale or damaged one, another Node)
// compiles the bundle as if there were no cache, as does V8 itself when it rejects the data (other
// flags); the result is the same either way. CRC-32 (zlib's, hardware-assisted) rather than a
// cryptographic hash: it guards against accidents, not tampering, and loading OpenSSL's digests
// would cost the start-up more than the check is worth.
import { Buffer, isAscii } from 'node:buffer';
import { readFileSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname } from 'node:path';
import { fileURLToPath, pathToFileURL, URL } from 'node:url';
import vm from 'node:vm';
import zlib from 'node:zlib';

export const BUNDLE = 'cli.cjs';
export const CACHE = 'cli.cjs.cache';

// the bundle runs as a CommonJS function body; import.meta.url is a parameter (esbuild's define)
// and __mwImport is the import function of its lazy parts (src/cli/load-tui.ts): a compiled script has no
// module loader of its own, so every import() of the bundle goes through this module's, beside the bundle
const HEAD = '(function (exports, require, module, __filename, __dirname, __mwMetaUrl, __mwImport) {';
const TAIL = '\n})';

/** the header: what the cache was made from, and a checksum of its bytes */
function headerOf(bundle, data) {
  const engine = `${process.version} ${process.arch} ${process.versions.v8}`;
  return `mixwright-code-cache ${zlib.crc32(bundle)} ${bundle.length} ${engine} ${zlib.crc32(data)} ${data.length}\n`;
}

/** the cached bytes, only when the header names this bundle and engine and the bytes are whole */
function readCache(file, bundle) {
  let buf;
  try {
    buf = readFileSync(file);
  } catch {
    return undefined;
  }
  const end = buf.indexOf(10);
  if (end < 0 || typeof zlib.crc32 !== 'function') return undefined;
  const data = buf.subarray(end + 1);
  return buf.toString('latin1', 0, end + 1) === headerOf(bundle, data) ? data : undefined;
}

/** write the cache for the bundle's bytes beside it */
export function writeCache(dir, bundle, data) {
  writeFileSync(
    fileURLToPath(new URL(CACHE, dir)),
    Buffer.concat([Buffer.from(headerOf(bundle, data)), data]),
  );
}

/**
 * Compile and run the bundle in `dir` (a file URL ending in /); `useCache` false ignores any cache.
 * Returns its exports, the compiled script (for createCachedData), its bytes and whether a cache was used.
 */
export function loadBundle(dir, useCache = true) {
  const file = fileURLToPath(new URL(BUNDLE, dir));
  const bundle = readFileSync(file);
  const cachedData = useCache ? readCache(`${file}.cache`, bundle) : undefined;
  // esbuild writes ASCII (non-ASCII text escaped): decoded as latin1, the same string, in half the time
  const text = isAscii(bundle) ? bundle.toString('latin1') : bundle.toString('utf8');
  const script = new vm.Script(HEAD + text + TAIL, {
    filename: file,
    cachedData,
  });
  const module = { exports: {} };
  script.runInThisContext()(
    module.exports,
    createRequire(file),
    module,
    file,
    dirname(file),
    pathToFileURL(file).href,
    (spec) => import(new URL(spec, dir).href),
  );
  return { exports: module.exports, script, bundle, cached: !!cachedData && !script.cachedDataRejected };
}
