// dist/mixwright.mjs: the command. Loads the bundle with its build-time code cache (cli-load.mjs).
import { URL } from 'node:url';
import { loadBundle } from './cli-load.mjs';

const { exports } = loadBundle(new URL('./', import.meta.url));
const code = await exports.startCli(process.argv.slice(2));
process.exitCode = code;

// Ending the process here, rather than letting Node take down a heap of some 90 MB, saves 15-20 ms
// of a `plan` (benchmarks: npm run bench). Only when nothing can be lost: every byte written to
// stdout and stderr has left the process (their writes are synchronous for files, pipes and
// terminals on Linux and macOS; elsewhere a buffered write keeps the normal exit) and nothing else
// is pending (no file operation, timer, child, worker or open input: a command that left one
// running ends the normal way, after it).
const STREAMS_ONLY = new Set(['PipeWrap', 'TTYWrap', 'CloseReq']);
if (
  process.stdout.writableLength === 0 &&
  process.stderr.writableLength === 0 &&
  process.getActiveResourcesInfo().every((r) => STREAMS_ONLY.has(r))
)
  process.exit(code);
