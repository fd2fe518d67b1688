// Worker thread of the parallel Monte Carlo: runs one stream of the core's trials and hands back its samples.
import { parentPort, workerData } from 'node:worker_threads';
import { monteCarloSamples } from '../core/index.js';
import type { McJob } from './parallel-mc.js';

const job = workerData as McJob;
const samples = monteCarloSamples(job.readings, job.settings, job.diluent, job.initial, job.trials, job.seed);
parentPort!.postMessage(samples, samples.map((s) => s.buffer as ArrayBuffer));
