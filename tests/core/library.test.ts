/**
 * The library API (design §9): `import { forces } from 'beatforce'` takes the scenario document and
 * returns the same answer as the command line. The package resolves its own name through
 * package.json "exports" to the build (dist/src/index.js, written by `npm run build`, which
 * `npm ci` runs through "prepare").
 */
import { existsSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import * as api from '../../src/index.js';

const root = new URL('../../', import.meta.url);
const pkg = JSON.parse(readFileSync(new URL('package.json', root), 'utf8')) as { name: string; version: string; main: string; types: string; exports: Record<string, { types: string; default: string }>; bin: Record<string, string> };
const built = existsSync(new URL('dist/src/index.js', root));
const doc = JSON.parse(readFileSync(new URL('examples/fly-tilted-stroke.json', root), 'utf8'));

describe("the package 'beatforce'", () => {
  it('exports forces(doc) from src/index.ts, answering a scenario document', () => {
    expect(typeof api.forces).toBe('function');
    const r = api.forces(doc);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.answer.version).toBe(pkg.version);
    const bad = api.forces({ organ: { mass: '12 mV' } });
    expect(bad.ok).toBe(false);
  });

  it('points its name, main, types and exports at the build of src/index.ts (dist/src/index.js)', () => {
    expect(pkg.name).toBe('beatforce');
    expect(pkg.exports['.']).toEqual({ types: './dist/src/index.d.ts', default: './dist/src/index.js' });
    expect(pkg.main).toBe('dist/src/index.js');
    expect(pkg.bin.beatforce).toBe('bin/beatforce.js');
    // tsconfig.build.json compiles src/ with rootDir "." into outDir "dist": src/index.ts → dist/src/index.js.
    const base = JSON.parse(readFileSync(new URL('tsconfig.json', root), 'utf8')) as { compilerOptions: { outDir: string; rootDir: string } };
    const build = JSON.parse(readFileSync(new URL('tsconfig.build.json', root), 'utf8')) as { extends: string; include: string[] };
    expect(build.extends).toBe('./tsconfig.json');
    expect(build.include).toContain('src');
    expect([base.compilerOptions.outDir, base.compilerOptions.rootDir]).toEqual(['dist', '.']);
  });

  it.skipIf(!built)("import('beatforce') resolves to the build and answers exactly as the source does", async () => {
    const name = 'beatforce'; // not a literal: the type check must not need the build
    const lib = (await import(name)) as typeof api;
    expect(typeof lib.forces).toBe('function');
    const fromBuild = lib.forces(doc), fromSource = api.forces(doc);
    expect(JSON.parse(JSON.stringify(fromBuild)), 'dist/ differs from src/: run npm run build').toEqual(JSON.parse(JSON.stringify(fromSource)));
  });
});
