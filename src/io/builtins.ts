/**
 * Node's built-in modules that only some commands use, loaded on first use. Loaded at
 * start-up (as a top-level import is in the bundle), crypto, os, child_process and
 * worker_threads cost every command tens of milliseconds, though `plan` needs none of them.
 */
import type * as Crypto from 'node:crypto';
import type * as ChildProcess from 'node:child_process';
import type * as Os from 'node:os';
import type * as WorkerThreads from 'node:worker_threads';

export const nodeCrypto = (): typeof Crypto => process.getBuiltinModule('node:crypto');
export const nodeChildProcess = (): typeof ChildProcess => process.getBuiltinModule('node:child_process');
export const nodeOs = (): typeof Os => process.getBuiltinModule('node:os');
export const nodeWorkerThreads = (): typeof WorkerThreads => process.getBuiltinModule('node:worker_threads');
