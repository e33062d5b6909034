/**
 * The same scenario through the command line (cli/main.ts with a fake io) and through the service
 * gives identical numbers: JSON answers equal but for the service's input hash, CSV tables equal
 * byte for byte, and refusals list the same issues.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { main } from '../../cli/main.js';
import type { Io } from '../../cli/io.js';
import { exampleText, JSON_HEADERS, ROOT, useApp } from './helpers.js';

function cli(argv: string[], stdin = ''): { code: number; out: string; err: string } {
  let out = '', err = '';
  const io: Io = { out: (t) => { out += t; }, err: (t) => { err += t; }, stdin: () => stdin };
  const code = main(argv, io);
  return { code, out, err };
}

const file = (name: string): string => fileURLToPath(new URL(`examples/${name}.json`, ROOT));

const app = useApp();

const post = (url: string, payload: string) => app().inject({ method: 'POST', url, payload, headers: JSON_HEADERS });

describe('CLI and service give the same numbers', () => {
  for (const name of ['fly-tilted-stroke', 'mems-tuning-fork', 'measured-stroke']) {
    it(`forces ${name}: JSON equal (service adds inputHash), CSV tables equal`, async () => {
      const c = cli(['forces', file(name), '--compact']);
      expect(c.code).toBe(0);
      const s = await post('/api/v1/forces', exampleText(name));
      expect(s.statusCode).toBe(200);
      const { inputHash, ...rest } = s.json() as Record<string, unknown>;
      expect(inputHash).toMatch(/^[0-9a-f]{16}$/);
      expect(rest).toEqual(JSON.parse(c.out));
      // Byte for byte, key order included: the CLI's JSON is the service's without the hash.
      expect(JSON.stringify(rest)).toBe(c.out.trim());
      const csvCli = cli(['forces', file(name), '--format', 'csv']);
      expect((await post('/api/v1/forces?format=csv', exampleText(name))).body).toBe(csvCli.out);
      const seriesCli = cli(['forces', file(name), '--format', 'csv', '--series']);
      expect((await post('/api/v1/forces?format=csv&table=series', exampleText(name))).body).toBe(seriesCli.out);
    });
  }

  for (const [command, name, tables] of [
    ['sensing', 'fly-sensing', [[[], '']]],
    ['sensing', 'mems-sensing', [[[], '']]],
    ['turn', 'fly-saccade', [[[], ''], [['--series'], '&table=series']]],
  ] as const) {
    it(`${command} ${name}: JSON equal (service adds inputHash), CSV tables equal`, async () => {
      const c = cli([command, file(name), '--compact']);
      expect(c.code).toBe(0);
      const s = await post(`/api/v1/${command}`, exampleText(name));
      expect(s.statusCode).toBe(200);
      const { inputHash, ...rest } = s.json() as Record<string, unknown>;
      expect(inputHash).toMatch(/^[0-9a-f]{16}$/);
      expect(JSON.stringify(rest)).toBe(c.out.trim());
      for (const [flags, query] of tables) {
        const csvCli = cli([command, file(name), '--format', 'csv', ...flags]);
        expect(csvCli.code).toBe(0);
        expect((await post(`/api/v1/${command}?format=csv${query}`, exampleText(name))).body).toBe(csvCli.out);
      }
    });
  }

  for (const name of ['fly-yaw-rate', 'mems-mode-split']) {
    it(`sweep examples/sweeps/${name}.json: JSON equal (service adds inputHash), CSV tables equal`, async () => {
      const path = fileURLToPath(new URL(`examples/sweeps/${name}.json`, ROOT));
      const text = readFileSync(path, 'utf8');
      const c = cli(['sweep', path, '--compact']);
      expect(c.code).toBe(0);
      const s = await post('/api/v1/sweep', text);
      expect(s.statusCode).toBe(200);
      const { inputHash, ...rest } = s.json() as Record<string, unknown>;
      expect(inputHash).toMatch(/^[0-9a-f]{16}$/);
      expect(JSON.stringify(rest)).toBe(c.out.trim());
      expect((await post('/api/v1/sweep?format=csv', text)).body).toBe(cli(['sweep', path, '--format', 'csv']).out);
    });
  }

  it('refuses an invalid scenario with the same issues (CLI on stderr, service in the body)', async () => {
    const doc = JSON.stringify({ organ: { mass: '12 mV', arm: '1 mm', frequency: '170 Hz', amplitude: '80 deg', rest: [0, 1, 0], normal: [1, 1, 0] }, sampling: { pointsPerBeat: 7 } });
    const c = cli(['forces', '-'], doc);
    expect(c.code).toBe(2);
    const s = await post('/api/v1/forces', doc);
    expect(s.statusCode).toBe(400);
    const issues = (s.json() as { issues: { path: string; message: string }[] }).issues;
    expect(issues.map((i) => i.path)).toEqual(['organ.mass', 'sampling.pointsPerBeat']);
    expect(c.err).toBe(`invalid scenario:\n${issues.map((i) => `  ${i.path}: ${i.message}`).join('\n')}\n`);
  });

  it('refuses work over a limit the same way (CLI exit 3, service 413)', async () => {
    const doc = JSON.stringify({ ...JSON.parse(exampleText('fly-tilted-stroke')), sampling: { pointsPerBeat: 4096, beats: 32 } });
    const c = cli(['forces', '-'], doc);
    expect(c.code).toBe(3);
    const s = await post('/api/v1/forces', doc);
    expect(s.statusCode).toBe(413);
    const issues = (s.json() as { issues: { path: string; message: string }[] }).issues;
    expect(c.err).toBe(`over a limit:\n${issues.map((i) => `  ${i.path}: ${i.message}`).join('\n')}\n`);
  });
});
