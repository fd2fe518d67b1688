// Worker thread of the parallel Monte Carlo: runs one stream of the core's trials and hands back its samples.
import { parentPort, workerData } from 'node:worker_threads';
import { monteCarloSamples, ProblemError } from '../core/index.js';
import type { McJob } from './parallel-mc.js';

const job = workerData as McJob;
try {
  const samples = monteCarloSamples(job);
  parentPort!.postMessage(
    samples,
    samples.map((s) => s.buffer as ArrayBuffer),
  );
} catch (e) {
  // a refusal of the input crosses the thread as data, so the command can word it (a class does not survive the copy)
  if (e instanceof ProblemError) parentPort!.postMessage({ problem: e.problem, where: e.where });
  else throw e;
}
