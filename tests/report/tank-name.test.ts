import { describe, expect, it } from 'vitest';
import { designOptions, runCli } from '../helpers.js';
import { tankName } from '../../src/report/format.js';

// a tank given only by its volume (--volume, no tank of the lab profile) has no name of its own:
// the loader's internal id "given-volume" is never shown as if it were one
const INLINE = designOptions({
  dilution: '0.9',
  volume: '30 L',
  pressure: '1500 Torr',
  temperature: '22 degC',
});

describe('a tank known only by its volume', () => {
  it('is named for a lab member, and a named tank keeps its id', () => {
    expect(tankName('given-volume')).toBe('unnamed tank (volume given)');
    expect(tankName('T-30')).toBe('T-30');
  });

  it('plan text and the sheet say so instead of showing the id "given-volume"', async () => {
    const plan = await runCli(['plan', ...INLINE]);
    expect(plan.stdout).toContain('Tank        unnamed tank (volume given): 30.00 L, rating not known');
    expect(plan.stdout).not.toContain('given-volume');
    const sheet = await runCli(['sheet', ...INLINE, '--format', 'md']);
    expect(sheet.stdout).toContain('1500 Torr in a 30.00 L tank');
    expect(sheet.stdout).toContain('unnamed tank (volume given), 30.00 L, rating not known');
    expect(sheet.stdout).not.toContain('given-volume');
  });

  it('plan --json keeps the tank id as data', async () => {
    const j = JSON.parse((await runCli(['plan', ...INLINE, '--json'])).stdout);
    expect(j.tank.id).toBe('given-volume');
  });
});
