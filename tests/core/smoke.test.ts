import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { forces, VERSION } from '../../src/index.js';

describe('forces(example)', () => {
  it('answers every shipped forces example with both organs and harmonic lines', () => {
    for (const name of ['fly-tilted-stroke', 'mems-tuning-fork', 'measured-stroke']) {
      const doc = JSON.parse(readFileSync(new URL(`../../examples/${name}.json`, import.meta.url), 'utf8'));
      const r = forces(doc);
      expect(r.ok, name).toBe(true);
      if (!r.ok) continue;
      expect(r.answer.organs.map((o) => o.role)).toEqual(['specified', 'mirror']);
      expect(r.answer.organs[0]?.harmonics.length).toBe(7 * 6 * (r.answer.scenario.sampling.harmonics + 1));
    }
  });

  it('VERSION equals the package version', () => {
    const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8'));
    expect(VERSION).toBe(pkg.version);
  });
});
