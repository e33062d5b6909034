import { writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../cli/main.js';
import type { Io } from '../../cli/io.js';
import { sensing } from '../../src/sensing/sensing.js';
import { example, withFields } from './helpers.js';

function run(argv: string[]): { code: number; out: string; err: string } {
  let out = '', err = '';
  const io: Io = { out: (t) => { out += t; }, err: (t) => { err += t; }, stdin: () => '' };
  return { code: main(argv, io), out, err };
}

const file = (doc: unknown): string => {
  const dir = mkdtempSync(join(tmpdir(), 'beatforce-sensing-'));
  const path = join(dir, 'scenario.json');
  writeFileSync(path, JSON.stringify(doc));
  return path;
};

describe('beatforce sensing FILE', () => {
  it('prints the same JSON as the library answer', () => {
    const r = run(['sensing', new URL('../../examples/mems-sensing.json', import.meta.url).pathname, '--compact']);
    expect(r.code).toBe(0);
    const lib = sensing(example('mems-sensing'));
    expect(lib.ok).toBe(true);
    if (lib.ok) expect(JSON.parse(r.out)).toEqual(JSON.parse(JSON.stringify(lib.answer)));
  });

  it('--format csv gives one row per organ and axis plus the pair, with units in the header', () => {
    const r = run(['sensing', new URL('../../examples/fly-sensing.json', import.meta.url).pathname, '--format', 'csv']);
    expect(r.code).toBe(0);
    const lines = r.out.trim().split('\r\n');
    expect(lines[0]).toMatch(/^side,role,axis,channel_axis,order,frequency_Hz,reference_phase_rad,scale_factor_strain_per_rad_s,/);
    expect(lines[0]).toMatch(/minimum_rate_rad_s/);
    expect(lines[0]).toMatch(/angle_random_walk_deg_per_h\^0\.5/);
    expect(lines.length).toBe(1 + 6 + 3);
    expect(lines[3]).toMatch(/^right,specified,yaw,normal,2,360,/);
    expect(lines[9]).toMatch(/^pair,both,yaw,/);
    // Without a mirror organ the pair rows are the one organ's lines read together, and say so.
    const single = run(['sensing', file(withFields(example('fly-sensing'), { organ: { ...(example('fly-sensing').organ as object), mirror: false } })), '--format', 'csv']);
    expect(single.code).toBe(0);
    const rows = single.out.trim().split('\r\n');
    expect(rows.length).toBe(1 + 3 + 3);
    expect(rows.slice(4).map((l) => l.split(',').slice(0, 3).join(','))).toEqual(['pair,specified,roll', 'pair,specified,pitch', 'pair,specified,yaw']);
  });

  it('refuses bad input with the field named and exit code 2', () => {
    const r = run(['sensing', file(withFields(example('fly-sensing'), { sensor: { threshold: 0 } }))]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/sensor\.threshold: 0 must be greater than zero/);
    expect(run(['--help']).out).toMatch(/sensing\s+scale factor/);
  });
});
