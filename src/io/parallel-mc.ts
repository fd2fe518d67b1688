/**
 * The Monte Carlo streams in parallel worker threads, where the bundled worker script
 * is next to the command (dist/mc-worker.mjs); otherwise the core runs them one after
 * another. Both give the same numbers: the streams and their seeds are the core's.
 */
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { nodeWorkerThreads } from './builtins.js';
import {
  evaluateUncertainty,
  ProblemError,
  type Problem,
  type Where,
  MC_STREAMS,
  streamSeed,
  streamTrials,
  type CheckedReading,
  type Fractions,
  type UncertaintyResult,
  type UncertaintySettings,
} from '../core/index.js';

export interface McJob {
  readonly readings: readonly CheckedReading[];
  readonly settings: UncertaintySettings;
  readonly diluent?: readonly string[];
  readonly initial?: { composition: Fractions; pressurePa: number; temperatureK: number };
  readonly trials: number;
  readonly seed: number;
}

function workerScript(): URL | undefined {
  const url = new URL('./mc-worker.mjs', import.meta.url);
  return url.protocol === 'file:' && existsSync(fileURLToPath(url)) ? url : undefined;
}

/** worth starting threads only for large runs */
const PARALLEL_FROM = 100000;

export async function evaluateUncertaintyParallel(
  readings: readonly CheckedReading[],
  settings: UncertaintySettings,
  diluent?: readonly string[],
  initial?: { composition: Fractions; pressurePa: number; temperatureK: number },
): Promise<UncertaintyResult> {
  const script = workerScript();
  if (!script || settings.trials < PARALLEL_FROM)
    return evaluateUncertainty(readings, settings, diluent, initial);
  const jobs: McJob[] = Array.from({ length: MC_STREAMS }, (_, i) => ({
    readings,
    settings,
    diluent,
    initial,
    trials: streamTrials(settings.trials, i),
    seed: streamSeed(settings.seed, i),
  }));
  const streams = await Promise.all(
    jobs.map(
      (job) =>
        new Promise<Float64Array[]>((resolve, reject) => {
          const w = new (nodeWorkerThreads().Worker)(script, { workerData: job });
          w.once('message', (m: Float64Array[] | { problem: Problem; where: Where }) => {
            if (Array.isArray(m)) resolve(m);
            else reject(new ProblemError(m.problem, m.where));
          });
          w.once('error', reject);
          w.once('exit', (code) => {
            if (code !== 0) reject(new Error(`Monte Carlo worker stopped with exit code ${code}`));
          });
        }),
    ),
  );
  return evaluateUncertainty(readings, settings, diluent, initial, streams);
}
