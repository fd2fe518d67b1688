import { describe, expect, it } from 'vitest';
import { readdirSync } from 'node:fs';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { mathjsBuilt } from '../../src/io/quantity.js';
import { planFill } from '../../src/core/index.js';

describe('start-up guard', () => {
  it('planning the demo recipes with the demo lab never builds mathjs (its units all take the fast table; building mathjs costs ~0.1 s)', () => {
    for (const f of readdirSync('recipes').filter((n) => n.endsWith('.yaml')))
      planFill(buildPlanRequest(readRecipe(`recipes/${f}`)).input);
    expect(mathjsBuilt()).toBe(false);
  });
});
