// A guided fill that went on through hazards its review found (the operator accepted them at the
// manifold: an acknowledge line with review.outcome "accepted") is never a bare pass of `check`: the
// verdict names the accepted hazards, text and JSON, and the exit code is 6 (README "Exit codes",
// precedence 4, 3, 6, 5). No computed number is checked here: the demo log's verdict is check's own.
import { copyFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { appendEvent, type NewLogEvent } from '../../src/io/batch-log.js';
import { checkExit } from '../../src/cli/commands/check.js';
import type { CheckReport } from '../../src/io/check.js';
import { runCli } from '../helpers.js';

const DEMO = 'batches/demo-ch4-phi1-ar98.jsonl';

function logWith(...events: NewLogEvent[]): string {
  const dir = mkdtempSync(join(tmpdir(), 'mw-accepted-'));
  const f = join(dir, 'b.jsonl');
  copyFileSync(DEMO, f);
  for (const e of events) appendEvent(f, e);
  return f;
}

const review = (outcome: 'accepted' | 'safer-stop'): NewLogEvent => ({
  kind: 'acknowledge',
  code: 'remainder-review',
  step: 3,
  by: 'QX',
  time: '2026-12-01T10:42:00Z',
  note: 'review of the remaining fills after the reading',
  review: {
    trigger: 'reading',
    outcome,
    hazards: [
      { code: 'flammable-state', step: 3, severity: 'warning' },
      { code: 'closed-vessel-pressure', step: 3, severity: 'danger' },
    ],
    ...(outcome === 'safer-stop' ? { stop: { step: 2, from_Pa: 53329, to_Pa: 60000 } } : {}),
  },
});

describe('check of a log whose fill went on through an accepted review hazard', () => {
  it('as the demo log checks (exit 7, not shown within tolerance), with the accepted review: the verdict names it and the exit is 6, text and JSON', async () => {
    expect((await runCli(['check', DEMO, '--json'])).code).toBe(7);
    const f = logWith(review('accepted'));
    const text = await runCli(['check', f]);
    expect(text.code).toBe(6);
    const verdict = text.stdout.split('\n').find((l) => l.startsWith('Verdict'))!;
    expect(verdict).toContain(
      'this is not a pass - ACCEPTED HAZARD (before fill 3: flammable-state (fill 3), closed-vessel-pressure (fill 3))',
    );
    expect(text.stdout).toContain('ACCEPTED HAZARD: before fill 3 the review of the re-targeted fills found');
    expect(text.stdout).toContain('QX went on through it at 2026-12-01T10:42:00Z');
    const json = await runCli(['check', f, '--json']);
    expect(json.code).toBe(6);
    const j = JSON.parse(json.stdout);
    // the overall verdict is the exit's (accepted hazard, 6); the demo log's own composition verdict
    // (within tolerance, its 95 % interval reaching past it: exit 7 alone) is beside it
    expect(j.verdict).toBe('accepted-hazard');
    expect(j.composition_verdict).toBe('pass-uncertain');
    expect(j.outcomes).toEqual(['accepted-hazard', 'not-shown-within-tolerance']);
    expect(j.accepted_hazards).toEqual([
      {
        found_by: 'fill-review',
        before_step: 3,
        by: 'QX',
        time: '2026-12-01T10:42:00Z',
        hazards: [
          { code: 'flammable-state', step: 3, severity: 'warning' },
          { code: 'closed-vessel-pressure', step: 3, severity: 'danger' },
        ],
      },
    ]);
    expect(j.verdict_caveats.join('\n')).toContain('ACCEPTED HAZARD');
  });

  it("the safer stop taken instead: no accepted hazard, the demo log's exit 7 (the review stays a warning of the record)", async () => {
    const f = logWith(review('safer-stop'));
    const r = await runCli(['check', f, '--json']);
    expect(r.code).toBe(7);
    expect(JSON.parse(r.stdout).accepted_hazards).toEqual([]);
  });

  it('precedence (README): out of tolerance 4, then a danger of the record 3, then an accepted hazard 6, then an altered record 5, then not shown / not closed 7', () => {
    const accepted = [{ found: 'review', step: 3, by: 'QX', time: 't', hazards: [] }];
    const report = (
      verdict: 'pass' | 'pass-uncertain' | 'fail',
      danger: boolean,
      acc: boolean,
      altered: boolean,
      closed = true,
    ) =>
      ({
        verdict: { verdict },
        findings: danger ? [{ severity: 'danger' }] : [],
        record: { alteredLines: altered ? [3] : [], closed, acceptedHazards: acc ? accepted : [] },
      }) as unknown as CheckReport;
    expect(checkExit(report('fail', true, true, true))).toBe(4);
    expect(checkExit(report('pass', true, true, true))).toBe(3);
    expect(checkExit(report('pass', false, true, true))).toBe(6);
    expect(checkExit(report('pass', false, false, true))).toBe(5);
    expect(checkExit(report('pass-uncertain', false, false, true))).toBe(5);
    expect(checkExit(report('pass-uncertain', false, false, false))).toBe(7);
    expect(checkExit(report('pass', false, false, false, false))).toBe(7);
    expect(checkExit(report('pass', false, false, false))).toBe(0);
  });

  it('a folder: the accepted hazard of one log is a mark of its summary row, and the exit is 6', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'mw-accepted-folder-'));
    copyFileSync(logWith(review('accepted')), join(folder, 'a.jsonl'));
    copyFileSync(DEMO, join(folder, 'b.jsonl'));
    const summary = await runCli(['check', folder]);
    expect(summary.code).toBe(6);
    expect(summary.stdout).toMatch(
      /a\.jsonl .*not shown within tolerance - not a pass, ACCEPTED HAZARD \(before fill 3/,
    );
  });
});
