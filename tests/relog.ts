// A batch log written again: its lines read without their hash links (the header, then the events in
// file order), changed by a test, and written anew through the log's own writer, so the new file is
// re-chained (a whole record, not an altered one). Shared by the tests that build a variant of a
// demo log (a reading on another gauge, lines inserted or left out, a withdrawal).
import { readFileSync } from 'node:fs';
import { appendEvent, createLog, type LogHeader, type NewLogEvent } from '../src/io/batch-log.js';

/** a log's header and events as written, without their hash links */
export function logLines(file: string): { header: LogHeader; events: NewLogEvent[] } {
  const [header, ...events] = readFileSync(file, 'utf8')
    .split('\n')
    .filter(Boolean)
    .map((l) => {
      const e = JSON.parse(l) as Record<string, unknown>;
      delete e.chain;
      return e;
    });
  return { header: header as unknown as LogHeader, events: events as unknown as NewLogEvent[] };
}

/** `file` written anew with `header` and `events`, each line chained to the one before; returns it */
export function rechain(file: string, header: LogHeader, events: readonly NewLogEvent[]): string {
  createLog(file, header);
  for (const e of events) appendEvent(file, e);
  return file;
}
