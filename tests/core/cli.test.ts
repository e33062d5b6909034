/**
 * The command line (`beatforce forces`), run through main() with a fake Io: the same answer as the
 * library, CSV tables, help, and the exit codes and messages for bad input, limits and bad files.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { COMMANDS } from '../../cli/commands/index.js';
import type { Io } from '../../cli/io.js';
import { main } from '../../cli/main.js';
import { forces, sweep, sweepCsv } from '../../src/index.js';

const example = (name: string) => new URL(`../../examples/${name}.json`, import.meta.url).pathname;

function cli(argv: string[], stdin = ''): { code: number; out: string; err: string } {
  let out = '', err = '';
  const io: Io = { out: (t) => (out += t), err: (t) => (err += t), stdin: () => stdin };
  const code = main(argv, io);
  return { code, out, err };
}

const dir = mkdtempSync(join(tmpdir(), 'beatforce-cli-'));
const file = (name: string, text: string) => {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
};
const organ = { mass: '6 ug', arm: '0.85 mm', frequency: '180 Hz', amplitude: '80 deg', rest: [0, 1, 0], normal: [1, 0, 0] };

describe('beatforce forces FILE', () => {
  it('prints the JSON answer of the library forces() for every shipped example', () => {
    for (const name of ['fly-tilted-stroke', 'mems-tuning-fork', 'measured-stroke']) {
      const r = cli(['forces', example(name)]);
      expect(r.code, r.err).toBe(0);
      const lib = forces(JSON.parse(readFileSync(example(name), 'utf8')));
      if (!lib.ok) throw new Error(name);
      expect(JSON.parse(r.out)).toEqual(JSON.parse(JSON.stringify(lib.answer)));
      expect(r.err).toBe(lib.answer.warnings.map((w) => `warning: ${w}\n`).join(''));
    }
  });

  it('reads standard input for "-", and --compact prints one line', () => {
    const text = readFileSync(example('fly-tilted-stroke'), 'utf8');
    const r = cli(['forces', '-', '--compact'], text);
    expect(r.code).toBe(0);
    expect(r.out.trimEnd().split('\n')).toHaveLength(1);
    expect(JSON.parse(r.out)).toEqual(JSON.parse(cli(['forces', example('fly-tilted-stroke')]).out));
  });

  it('--format csv prints the harmonic table: a header with units and one row per organ, component, axis and order', () => {
    const r = cli(['forces', example('fly-tilted-stroke'), '--format', 'csv']);
    expect(r.code).toBe(0);
    const rows = r.out.split('\r\n');
    expect(rows.pop()).toBe(''); // CRLF after the last row (RFC 4180)
    expect(rows[0]).toBe('side,role,component,axis,order,amplitude_N,phase_rad');
    expect(rows).toHaveLength(1 + 2 * 7 * 6 * 9);
    const lib = forces(JSON.parse(readFileSync(example('fly-tilted-stroke'), 'utf8')));
    if (!lib.ok) throw new Error('fly');
    const l = lib.answer.organs[1]!.harmonics.find((x) => x.component === 'coriolis' && x.axis === 'normal' && x.order === 2)!;
    expect(rows).toContain(`left,mirror,coriolis,normal,2,${l.amplitude},${l.phase}`);
  });

  it('--format csv --series prints the load series: one row per organ and sample, a column per component and axis', () => {
    const r = cli(['forces', example('mems-tuning-fork'), '--format=csv', '--series']);
    expect(r.code).toBe(0);
    const rows = r.out.trimEnd().split('\r\n');
    const header = rows[0]!.split(',');
    expect(header.slice(0, 4)).toEqual(['side', 'role', 'time_s', 'stroke_m']);
    expect(header).toHaveLength(4 + 7 * 6);
    expect(header).toContain('coriolis_sense_N');
    expect(rows).toHaveLength(1 + 2 * 64); // two organs × 64 points × 1 beat
    expect(rows.every((row) => row.split(',').length === header.length)).toBe(true);
  });

  it('--series without --format csv, an unknown option or a bad format is a usage error (exit 1)', () => {
    expect(cli(['forces', example('fly-tilted-stroke'), '--series'])).toMatchObject({ code: 1, out: '' });
    expect(cli(['forces', example('fly-tilted-stroke'), '--format', 'xml']).err).toMatch(/^beatforce forces: --format xml: expected json or csv\nusage: beatforce forces FILE/);
    expect(cli(['forces', example('fly-tilted-stroke'), '--colour']).err).toMatch(/unknown option --colour/);
    expect(cli(['forces']).err).toMatch(/a scenario FILE \(or - for standard input\) is required/);
  });
});

describe('beatforce --help and unknown commands', () => {
  it('--help lists every command, with exit code 0; no command prints help with exit 1', () => {
    const r = cli(['--help']);
    expect(r.code).toBe(0);
    for (const c of COMMANDS) expect(r.out).toContain(`  ${c.name}`);
    expect(r.out).toMatch(/Exit codes: 0 done, 1 usage error, 2 invalid scenario or sweep request, 3 over a limit\./);
    expect(cli([])).toMatchObject({ code: 1, out: r.out });
  });

  it('forces --help prints the command usage; an unknown command exits 1', () => {
    const h = cli(['forces', '--help']);
    expect(h.code).toBe(0);
    expect(h.out).toMatch(/^usage: beatforce forces FILE\|- \[--format json\|csv\] \[--series\] \[--compact\]/);
    const u = cli(['force', 'x.json']);
    expect(u.code).toBe(1);
    expect(u.err).toMatch(/^beatforce: unknown command 'force'/);
  });
});

describe('beatforce forces: refusals', () => {
  it('an invalid scenario exits 2 and names every field, as the service does', () => {
    const r = cli(['forces', file('bad.json', JSON.stringify({ organ: { ...organ, mass: '12 mV', rest: [0, 0, 0] } }))]);
    expect(r.code).toBe(2);
    expect(r.out).toBe('');
    expect(r.err).toBe(
      "invalid scenario:\n  organ.mass: '12 mV' is not a mass; expected a mass: a number in kg or a string such as '7 ug'\n  organ.rest: [0,0,0] has zero length; expected a direction [x, y, z] in body axes\n",
    );
  });

  it('work over a limit exits 3 and names the limit', () => {
    const r = cli(['forces', file('big.json', JSON.stringify({ organ, sampling: { pointsPerBeat: 8192, beats: 16 } }))]);
    expect(r.code).toBe(3);
    expect(r.err).toBe('over a limit:\n  sampling.beats: 8192 points × 16 beats = 131072 samples is over the limit of 65536 samples per request\n');
  });

  it('a document nested deeper than the limit exits 3, however deep', () => {
    for (const command of ['forces', 'sensing', 'turn']) {
      const r = cli([command, file('deep.json', '['.repeat(100_000) + ']'.repeat(100_000))]);
      expect(r).toEqual({ code: 3, out: '', err: 'over a limit:\n  [0][0][0][0][0][0][0][0]…: is at nesting level 33, over the limit of 32 levels of arrays and objects; a scenario document needs at most 7\n' });
    }
  });

  it('more than one FILE is a usage error (exit 1), not a silent choice of the first', () => {
    const r = cli(['forces', example('fly-tilted-stroke'), example('mems-tuning-fork')]);
    expect(r.code).toBe(1);
    expect(r.out).toBe('');
    expect(r.err).toMatch(/^beatforce forces: one scenario FILE at a time; got 2: \S+fly-tilted-stroke\.json \S+mems-tuning-fork\.json\nusage: beatforce forces FILE/);
  });

  it('an unreadable file or bad JSON exits 2 with the reason', () => {
    const missing = join(dir, 'missing.json');
    expect(cli(['forces', missing])).toEqual({ code: 2, out: '', err: `invalid scenario:\n  (file): cannot read ${missing}: ENOENT\n` });
    expect(cli(['forces', dir]).err).toBe(`invalid scenario:\n  (file): cannot read ${dir}: EISDIR\n`);
    const r = cli(['forces', file('broken.json', '{ "organ": ')]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^invalid scenario:\n {2}\(document\): is not valid JSON: /);
    expect(cli(['forces', '-'], 'not json').code).toBe(2);
  });
});

describe('beatforce sweep FILE', () => {
  const sweepFile = (name: string) => new URL(`../../examples/sweeps/${name}.json`, import.meta.url).pathname;
  const shipped = ['fly-yaw-rate', 'mems-mode-split'];

  it('prints the JSON answer of the library sweep() and, with --format csv, its table, for every shipped sweep', () => {
    for (const name of shipped) {
      const request: unknown = JSON.parse(readFileSync(sweepFile(name), 'utf8'));
      const lib = sweep(request);
      if (!lib.ok) throw new Error(`${name}: ${JSON.stringify(lib.issues)}`);
      const r = cli(['sweep', sweepFile(name)]);
      expect(r.code, r.err).toBe(0);
      expect(JSON.parse(r.out)).toEqual(JSON.parse(JSON.stringify(lib.answer)));
      const c = cli(['sweep', sweepFile(name), '--format', 'csv']);
      expect(c.code).toBe(0);
      expect(c.out).toBe(sweepCsv(lib.answer));
      expect(c.out.split('\r\n')).toHaveLength(lib.answer.points + 2); // header, rows, and the empty string after the last CRLF
    }
  });

  it('the shipped sweeps take the methods they describe', () => {
    expect(JSON.parse(cli(['sweep', sweepFile('fly-yaw-rate')]).out)).toMatchObject({ method: 'rate-polynomial', path: 'closed-form', points: 41 });
    expect(JSON.parse(cli(['sweep', sweepFile('mems-mode-split')]).out)).toMatchObject({ method: 'per-point', points: 25 });
  });

  it('refuses an invalid request (exit 2), a grid over the limit (exit 3) and a missing FILE (exit 1), naming the sweep request', () => {
    const bad = cli(['sweep', '-'], JSON.stringify({ scenario: { organ }, vary: [{ field: 'organ.colour', values: [1] }] }));
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/^invalid sweep request:\n {2}outputs: is required; expected a list of outputs/);
    const big = cli(['sweep', '-'], JSON.stringify({ scenario: { organ }, vary: [{ field: 'organ.mass', from: '1 ug', to: '2 ug', steps: 1001 }], outputs: [{ line: { component: 'total', axis: 'x', order: 1 } }] }));
    expect(big.code).toBe(3);
    expect(big.err).toMatch(/^over a limit:\n {2}vary: /);
    const none = cli(['sweep']);
    expect(none.code).toBe(1);
    expect(none.err).toMatch(/^beatforce sweep: a sweep request FILE \(or - for standard input\) is required\nusage: beatforce sweep FILE/);
  });
});

describe('beatforce as a process', () => {
  it('ends quietly with exit 0 when its reader closes the pipe early (| head)', () => {
    // The reader takes one line and exits; the command's remaining output meets a closed pipe.
    const root = new URL('../../', import.meta.url).pathname;
    const r = spawnSync('bash', ['-o', 'pipefail', '-c', `"${process.execPath}" --import tsx cli/bin.ts forces examples/fly-tilted-stroke.json --format csv --series | head -n 1`], { cwd: root, encoding: 'utf8' });
    expect(r.status).toBe(0);
    expect(r.stdout.split('\n')[0]).toMatch(/^side,role,time_s,stroke_rad,/);
    expect(r.stderr).toBe('');
  }, 30_000);
});
