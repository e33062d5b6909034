/**
 * End-to-end tests of the bench page in headless Chromium (Debian's /usr/bin/chromium driven by
 * playwright-core): the page must draw exactly the numbers the service returns for the same
 * document, place the service's issues beside their fields, and export what the service exports.
 * The reference for every plotted number is an independent request from this test to the service.
 */
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildPage, startService, type Running } from './server.js';

/** Asynchronous: the service answers from this same process, so the event loop must stay free. */
const run = promisify(execFile);
const ROOT = join(import.meta.dirname, '..', '..');
const ARTIFACTS = join(ROOT, 'test-artifacts');
const CHROMIUM = '/usr/bin/chromium';
const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

type Json = Record<string, unknown>;
interface Line { component: string; axis: string; order: number; amplitude: number; phase: number }
interface Organ { side: string; role: string; frame: Record<string, number[]>; harmonics: Line[]; series?: { time: number[]; loads: Record<string, Record<string, number[]>> } }
interface Forces { version: string; scenario: { sampling: { pointsPerBeat: number; harmonics: number }; organ: { drive: string } }; organs: Organ[] }
interface PlotRecord { title: string; labels: string[]; data: (number | null)[][] }

let service: Running;
let ctx: BrowserContext;
let page: Page;
let profile: string;
const consoleErrors: string[] = [];
/** 4xx answers the tests provoked on purpose (Chromium logs each as "Failed to load resource"). */
const refused: { url: string; status: number; provoked: boolean }[] = [];
/** True while a test feeds the page an invalid scenario on purpose. */
let provoking = false;
const timings: Record<string, number> = {};
/** Milestones of the cold first render (ms since navigation start). */
let coldMarks: Record<string, number> = {};

async function api<T>(route: string, body?: unknown, query = ''): Promise<{ status: number; body: T; text: string }> {
  const res = await fetch(`${service.url}/api/v1/${route}${query}`, body === undefined ? {} : { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  const text = await res.text();
  let parsed: unknown = text;
  try { parsed = JSON.parse(text); } catch { /* CSV */ }
  return { status: res.status, body: parsed as T, text };
}

const bench = <T>(fn: string): Promise<T> => page.evaluate(`window.__bench.${fn}`) as Promise<T>;
const runs = () => bench<number>('runs');
const plots = () => bench<Record<string, PlotRecord>>('plots()');
const pageDoc = () => bench<Json>('doc()');

/** Wait until the page has finished a run after `before` runs. */
async function settled(before: number): Promise<void> {
  await page.waitForFunction((n) => {
    const b = (window as unknown as { __bench?: { idle: boolean; runs: number } }).__bench;
    return !!b && b.idle && b.runs > n;
  }, before, { timeout: 15_000 });
}

/** Relative agreement, with an absolute floor for values at numerical zero. */
function expectClose(got: (number | null)[], want: number[], rel = 1e-12): void {
  expect(got.length).toBe(want.length);
  const scale = Math.max(...want.map(Math.abs));
  got.forEach((g, i) => expect(Math.abs((g ?? 0) - (want[i] as number))).toBeLessThanOrEqual(rel * scale + 1e-300));
}

/** The page's load panels and spectrum stems equal the service's answer for the same document. */
async function expectPlotsMatch(answer: Forces, axis: string): Promise<void> {
  const p = await plots();
  const n = answer.scenario.sampling.pointsPerBeat;
  const spec = answer.organs.find((o) => o.role === 'specified') as Organ;
  const mirror = answer.organs.find((o) => o.role === 'mirror');
  const loadPlots = Object.keys(p).filter((k) => k.startsWith('loads-'));
  if (!spec.series) {
    expect(loadPlots).toEqual([]);
    expect(await page.textContent('#loads-note')).toContain('output.series is false');
  } else expect(loadPlots.length, `plots: ${Object.keys(p).join(' ')}`).toBeGreaterThan(0);
  for (const id of loadPlots) {
    const c = id.slice('loads-'.length);
    const rec = p[id] as PlotRecord;
    expectClose(rec.data[0] as number[], (spec.series?.time ?? []).slice(0, n).map((t) => t * 1e3));
    expectClose(rec.data[1] as number[], (spec.series?.loads[c]?.[axis] ?? []).slice(0, n));
    if (mirror) expectClose(rec.data[2] as number[], (mirror.series?.loads[c]?.[axis] ?? []).slice(0, n));
  }
  const specPlots = Object.keys(p).filter((k) => k.startsWith('spectrum-'));
  expect(specPlots.length).toBeGreaterThan(0);
  for (const id of specPlots) {
    const c = id.slice('spectrum-'.length);
    const rec = p[id] as PlotRecord;
    const drawn = (rec.data[1] as (number | null)[]).map((v, k) => [k, v] as const).filter(([, v]) => v !== null);
    expect(drawn.length).toBeGreaterThan(0);
    for (const [k, v] of drawn) {
      const line = spec.harmonics.find((l) => l.component === c && l.axis === axis && l.order === k);
      expect(v).toBe(line?.amplitude);
    }
  }
}

interface AxisSensing { snr: number | null; minimumRate: number | null; detectable?: boolean | null }
interface Sensing { organs: { role: string; axes: Record<string, AxisSensing> }[]; pair: Record<string, { minimumRate: number | null }> }
const DEG = Math.PI / 180;

/**
 * The detection panels: the plotted SNR at sampled rates equals the sensing answer for a scenario
 * set to that rate (an independent request per point), and the marks are the minimum rates.
 */
async function expectDetectionMatches(doc: Json): Promise<number> {
  const sensing = await api<Sensing>('sensing', doc);
  expect(sensing.status).toBe(200);
  // "this turn" in the summary: the specified organ's verdict on the scenario's rate, per axis.
  const verdicts = await page.$$eval('.min-rates tbody tr', (rows) => rows.map((r) => r.children[2]?.textContent ?? ''));
  const organ = sensing.body.organs.find((o) => o.role === 'specified');
  expect(verdicts.map((v) => v.split(' ')[0])).toEqual(['roll', 'pitch', 'yaw'].map((ax) => {
    const d = organ?.axes[ax]?.detectable;
    return d === true ? 'seen' : d === false ? 'missed' : '–';
  }));
  const p = await plots();
  let checked = 0;
  for (const ax of ['roll', 'pitch', 'yaw']) {
    const rec = p[`snr-${ax}`] as (PlotRecord & { marks?: Record<string, number | null> }) | undefined;
    const spec = sensing.body.organs.find((o) => o.role === 'specified')?.axes[ax];
    if (!rec) {
      expect(spec?.minimumRate ?? null).toBeNull();
      continue;
    }
    expect(rec.marks?.organMinimumRate).toBe(spec?.minimumRate);
    expect(rec.marks?.pairMinimumRate).toBe(sensing.body.pair[ax]?.minimumRate);
    const xs = rec.data[0] as number[];
    for (const i of [0, Math.floor(xs.length / 2), xs.length - 1]) {
      const rate = (xs[i] as number) * DEG;
      const at = structuredClone(doc) as Json & { body?: Json & { rate?: Json } };
      at.body = { ...(at.body ?? {}), rate: { ...((at.body?.rate as Json | undefined) ?? {}), [ax]: rate } };
      const one = await api<Sensing>('sensing', at);
      const want = one.body.organs.find((o) => o.role === 'specified')?.axes[ax]?.snr as number;
      const got = rec.data[1]?.[i] as number;
      expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-9 * Math.abs(want));
      checked++;
    }
  }
  return checked;
}

interface Turn { beats: { time: number; trueRate: Record<string, number>; estimatedRate: Record<string, number | null> }[]; series?: { time: number[]; organs: { role: string; strain?: Record<string, number[]> }[] } }

/** The maneuver panels equal the turn answer for the same document. */
async function expectTurnMatches(doc: Json): Promise<void> {
  const turn = await api<Turn>('turn', doc);
  expect(turn.status).toBe(200);
  const p = await plots();
  const rates = p['turn-rates'] as PlotRecord;
  expectClose(rates.data[0] as number[], turn.body.beats.map((b) => b.time * 1e3));
  rates.labels.forEach((label, i) => {
    const m = /^(true|estimated) (roll|pitch|yaw)$/.exec(label);
    if (!m) return;
    const want = turn.body.beats.map((b) => ((m[1] === 'true' ? b.trueRate : b.estimatedRate)[m[2] as string] ?? NaN) / DEG);
    expectClose((rates.data[i] as number[]).map((v) => v ?? NaN), want, 1e-12);
  });
  expect(rates.labels.filter((l) => l.startsWith('true')).length).toBeGreaterThan(0);
  const strain = turn.body.series?.organs.find((o) => o.role === 'specified')?.strain;
  const time = (turn.body.series?.time ?? []).map((t) => t * 1e3);
  if (strain) {
    for (const kind of ['outOfPlane', 'inPlane', 'axial']) {
      const trace = p[`turn-strain-${kind}`] as PlotRecord;
      expectClose(trace.data[0] as number[], time);
      expectClose(trace.data[1] as number[], strain[kind] as number[]);
    }
  } else expectClose((p['turn-load'] as PlotRecord).data[0] as number[], time);
}

beforeAll(async () => {
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: install Debian's chromium (apt-get install -y chromium) to run the browser tests`);
  const t0 = performance.now();
  const sizes = await buildPage();
  timings.buildMs = performance.now() - t0;
  timings.bundleBytes = sizes['app.js'] ?? 0;
  mkdirSync(ARTIFACTS, { recursive: true });
  service = await startService();
  profile = mkdtempSync(join(tmpdir(), 'bench-chromium-'));
  ctx = await chromium.launchPersistentContext(profile, { executablePath: CHROMIUM, headless: true, args: ARGS, viewport: { width: 1280, height: 800 }, acceptDownloads: true });
  page = ctx.pages()[0] ?? (await ctx.newPage());
  page.on('console', (m) => { if (m.type() === 'error') consoleErrors.push(`${m.text()} @ ${m.location().url}`); });
  page.on('pageerror', (e) => consoleErrors.push(`pageerror: ${e.message}`));
  page.on('response', (r) => { if (r.status() >= 400) refused.push({ url: r.url(), status: r.status(), provoked: provoking }); });
});

afterAll(async () => {
  await ctx?.close();
  await service?.close();
  if (profile) rmSync(profile, { recursive: true, force: true });
  console.log(`bench page: ${JSON.stringify(timings)}; cold first render milestones: ${JSON.stringify(coldMarks, (_k, v: unknown) => (typeof v === 'number' ? Math.round(v) : v))}`);
});

describe('the bench page in Chromium', () => {
  it('draws the default scenario with the numbers the service returns, and measures the first render', async () => {
    const t0 = performance.now();
    await page.goto(`${service.url}/`, { waitUntil: 'load' });
    await settled(0);
    timings.firstRenderFromTestMs = Math.round(performance.now() - t0);
    timings.firstRenderInPageMs = Math.round(await bench<number>('firstRenderMs'));
    coldMarks = await bench<Record<string, number>>('marks');
    expect(timings.firstRenderInPageMs).toBeLessThan(5_000); // loose: reported, not a speed target

    const doc = await pageDoc();
    const example = await api<Json>('examples/fly-tilted-stroke');
    expect(doc).toEqual(example.body);
    const answer = await api<Forces>('forces', doc);
    expect(answer.status).toBe(200);
    const axis = await page.inputValue('#axis');
    expect(axis).toBe('normal');
    await expectPlotsMatch(answer.body, axis);

    // The sketch draws the service's normalised frame, not the typed vector.
    const geometry = JSON.parse((await page.getAttribute('#sketch', 'data-geometry')) ?? '{}') as { organs: { role: string; e3: number[] }[] };
    const spec = answer.body.organs.find((o) => o.role === 'specified') as Organ;
    expect(geometry.organs.find((o) => o.role === 'specified')?.e3).toEqual(spec.frame.normal);
    expect(await page.textContent('footer')).toContain('they do not certify a navigation or safety sensor');
    expect(await page.textContent('#version')).toBe(answer.body.version);
    await page.screenshot({ path: join(ARTIFACTS, 'bench-default-1280x800.png') });
    await page.screenshot({ path: join(ARTIFACTS, 'bench-default-full.png'), fullPage: true });

    // Again with the service and the browser warm (the scenario now comes from the address).
    const t1 = performance.now();
    await page.reload({ waitUntil: 'load' });
    await settled(0);
    timings.warmReloadFromTestMs = Math.round(performance.now() - t1);
    timings.warmFirstRenderInPageMs = Math.round(await bench<number>('firstRenderMs'));
    expect(timings.warmFirstRenderInPageMs).toBeLessThan(5_000);
    await expectPlotsMatch(answer.body, axis);
  });

  it('loads each shipped example and draws its answer', async () => {
    const list = await api<{ examples: { name: string }[] }>('examples');
    expect(list.body.examples.length).toBeGreaterThanOrEqual(3);
    for (const { name } of list.body.examples) {
      const before = await runs();
      await page.selectOption('#example', name);
      await settled(before);
      const doc = await api<Json>(`examples/${name}`);
      expect(await pageDoc()).toEqual(doc.body);
      const answer = await api<Forces>('forces', doc.body);
      expect(answer.status).toBe(200);
      const axis = await page.inputValue('#axis');
      expect(axis).toBe(answer.body.scenario.organ.drive === 'rotary' ? 'normal' : 'sense');
      await expectPlotsMatch(answer.body, axis);
      timings[`snrPointsChecked_${name}`] = await expectDetectionMatches(doc.body);
      const maneuver = (doc.body.body as Json | undefined)?.maneuver !== undefined;
      expect(await page.isVisible('#card-turn')).toBe(maneuver);
      if (maneuver) await expectTurnMatches(doc.body);
      await page.screenshot({ path: join(ARTIFACTS, `bench-example-${name}.png`), fullPage: true });
    }
  });

  it('redraws with the service numbers after a field changes (typed from the keyboard)', async () => {
    let before = await runs();
    await page.selectOption('#example', 'fly-tilted-stroke');
    await settled(before);
    const old = (await plots())['spectrum-coriolis']?.data[1];
    before = await runs();
    await page.click('#f-body-rate-yaw', { clickCount: 3 });
    await page.keyboard.type('900 deg/s');
    await settled(before);
    const doc = await pageDoc();
    expect((doc.body as Json & { rate: Json }).rate.yaw).toBe('900 deg/s');
    const answer = await api<Forces>('forces', doc);
    await expectPlotsMatch(answer.body, 'normal');
    expect((await plots())['spectrum-coriolis']?.data[1]).not.toEqual(old);

    // Another axis, chosen with the keyboard only.
    await page.focus('#axis');
    await page.keyboard.press('ArrowUp'); // normal → tangential
    expect(await page.inputValue('#axis')).toBe('tangential');
    await expectPlotsMatch(answer.body, 'tangential');
  });

  it('switches the drive and the optional blocks, keeping the document valid and the plots true', async () => {
    let before = await runs();
    await page.selectOption('#example', 'fly-tilted-stroke');
    await settled(before);
    const original = await pageDoc();

    before = await runs();
    await page.selectOption('#f-organ-drive', 'linear');
    await settled(before);
    const linear = await pageDoc();
    const organ = linear.organ as Json;
    expect(organ.drive).toBe('linear');
    expect(organ.arm).toBeUndefined();
    expect(organ.driveAxis).toBeDefined();
    const answer = await api<Forces>('forces', linear);
    expect(answer.status).toBe(200);
    expect(await page.inputValue('#axis')).toBe('sense');
    await expectPlotsMatch(answer.body, 'sense');

    before = await runs();
    await page.selectOption('#f-organ-drive', 'rotary');
    await settled(before);
    const back = await pageDoc();
    expect({ ...back, organ: { ...(back.organ as Json), drive: undefined } }).toEqual({ ...original, organ: { ...(original.organ as Json), drive: undefined } });

    // A maneuver switched on from its folded group: the turn panels appear with the service's numbers.
    before = await runs();
    await page.click('#group-maneuver > summary');
    await page.check('#block-maneuver');
    await settled(before);
    const withTurn = await pageDoc();
    expect((withTurn.body as Json).maneuver).toBeDefined();
    expect(await page.isVisible('#card-turn')).toBe(true);
    await expectTurnMatches(withTurn);
    before = await runs();
    await page.uncheck('#block-maneuver');
    await settled(before);
    expect(await page.isVisible('#card-turn')).toBe(false);
    expect(Object.keys(await plots()).filter((k) => k.startsWith('turn-'))).toEqual([]);
    expect(await pageDoc()).toEqual(original);
  });

  it('shows the service’s issue beside the field it names, and clears it when fixed', async () => {
    provoking = true;
    let before = await runs();
    await page.fill('#f-organ-mass', '12 mV');
    await settled(before);
    const doc = await pageDoc();
    const refusal = await api<{ issues: { path: string; message: string }[] }>('forces', doc);
    expect(refusal.status).toBe(400);
    const issue = refusal.body.issues.find((i) => i.path === 'organ.mass');
    expect(issue?.message).toContain("'12 mV' is not a mass");
    const row = page.locator('[data-field="organ-mass"]');
    expect(await row.locator('.issue').textContent()).toBe(issue?.message);
    expect(await page.getAttribute('#f-organ-mass', 'aria-invalid')).toBe('true');
    expect(await page.locator('.banner.error').textContent()).toContain('refused');
    await page.screenshot({ path: join(ARTIFACTS, 'bench-issue-beside-field.png') });

    // A normal that is not perpendicular to the arm: the issue sits by the normal, the sketch shows it.
    before = await runs();
    await page.fill('#f-organ-mass', '6 ug');
    await page.fill('#f-organ-normal', '0.2');
    await page.fill('#f-organ-normal-1', '1');
    await page.fill('#f-organ-normal-2', '0');
    await settled(before);
    const normalIssue = await api<{ issues: { path: string; message: string }[] }>('forces', await pageDoc());
    const msg = normalIssue.body.issues.find((i) => i.path === 'organ.normal')?.message ?? '';
    expect(msg).toContain('not perpendicular');
    expect(await page.locator('[data-field="organ-normal"] .issue').textContent()).toBe(msg);
    expect(await page.locator('[data-field="organ-mass"] .issue').textContent()).toBe('');
    expect(JSON.parse((await page.getAttribute('#sketch', 'data-geometry')) ?? '{}').problem).toContain('organ.normal');
    await page.screenshot({ path: join(ARTIFACTS, 'bench-wrong-normal.png') });

    // Work over a limit: 413, and the limit's message beside the field it names.
    before = await runs();
    await page.fill('#f-organ-normal', '0.906');
    await page.fill('#f-organ-normal-1', '0');
    await page.fill('#f-organ-normal-2', '0.423');
    await page.fill('#f-sampling-pointsPerBeat', '100000');
    await settled(before);
    const over = await api<{ issues: { path: string; message: string }[] }>('forces', await pageDoc());
    expect(over.status).toBe(413);
    const limitMsg = over.body.issues.find((i) => i.path === 'sampling.pointsPerBeat')?.message ?? '';
    expect(limitMsg).toContain('limit');
    expect(await page.locator('[data-field="sampling-pointsPerBeat"] .issue').textContent()).toBe(limitMsg);
    expect(await page.locator('[data-field="organ-normal"] .issue').textContent()).toBe('');

    provoking = false;
    before = await runs();
    await page.fill('#f-sampling-pointsPerBeat', '256');
    await page.fill('#f-organ-normal', '0.906');
    await page.fill('#f-organ-normal-1', '0');
    await page.fill('#f-organ-normal-2', '0.423');
    await settled(before);
    expect(await page.locator('.issue .issue-text').count()).toBe(0);
    expect(await page.getAttribute('#f-organ-normal', 'aria-invalid')).toBeNull();
  });

  it('downloads the harmonic lines as the service’s CSV and the answer as JSON', async () => {
    const doc = await pageDoc();
    const [csvDownload] = await Promise.all([page.waitForEvent('download'), page.click('#dl-csv')]);
    const csv = readFileSync((await csvDownload.path()) as string, 'utf8');
    const want = await api<string>('forces', doc, '?format=csv&table=harmonics');
    expect(csv).toBe(want.text);
    expect(csv.split('\r\n')[0]).toContain('amplitude');

    const [seriesDownload] = await Promise.all([page.waitForEvent('download'), page.click('#dl-series')]);
    const series = readFileSync((await seriesDownload.path()) as string, 'utf8');
    expect(series).toBe((await api<string>('forces', doc, '?format=csv&table=series')).text);

    const [jsonDownload] = await Promise.all([page.waitForEvent('download'), page.click('#dl-json')]);
    const json = JSON.parse(readFileSync((await jsonDownload.path()) as string, 'utf8')) as { forces: Forces; sensing: Json };
    const answer = await api<Forces>('forces', doc);
    expect(json.forces.organs).toEqual(answer.body.organs);
    expect(json.sensing.pair).toEqual((await api<Json>('sensing', doc)).body.pair);
  });

  it('copies the view as a curl request that reruns to the same answer', async () => {
    await page.click('#copy-request');
    const curl = await page.inputValue('#request-curl');
    const python = await page.inputValue('#request-python');
    const out = JSON.parse((await run('bash', ['-c', curl], { maxBuffer: 1 << 26 })).stdout) as Forces;
    const answer = await api<Forces>('forces', await pageDoc());
    expect(out.organs).toEqual(answer.body.organs);
    await page.selectOption('#request-route', 'sensing');
    const sensingCurl = await page.inputValue('#request-curl');
    expect(sensingCurl).toContain('/api/v1/sensing');
    const sensingOut = JSON.parse((await run('bash', ['-c', sensingCurl], { maxBuffer: 1 << 26 })).stdout) as Json;
    expect(sensingOut.organs).toEqual((await api<Json>('sensing', await pageDoc())).body.organs);
    await page.selectOption('#request-route', 'forces');
    const py = (await run('python3', ['-c', python], { maxBuffer: 1 << 26, env: { ...process.env, PYTHONPATH: join(ROOT, 'examples') } })).stdout;
    expect(py).toContain(answer.body.version);
    await page.screenshot({ path: join(ARTIFACTS, 'bench-copy-request.png') });
    await page.keyboard.press('Escape');
    expect(await page.locator('#request-dialog').getAttribute('open')).toBeNull();
  });

  it('keeps the scenario in the address: a reload in a fresh tab shows the same view', async () => {
    let before = await runs();
    await page.fill('#f-body-rate-pitch', '250 deg/s');
    await settled(before);
    const doc = await pageDoc();
    const url = page.url();
    expect(url).toMatch(/#s=/);
    const tab = await ctx.newPage();
    tab.on('console', (m) => { if (m.type() === 'error') consoleErrors.push(`${m.text()} @ ${m.location().url}`); });
    await tab.evaluate(() => localStorage.clear()).catch(() => undefined);
    await tab.goto(url);
    await tab.waitForFunction(() => (window as unknown as { __bench?: { runs: number } }).__bench?.runs === 1);
    expect(await tab.evaluate('window.__bench.doc()')).toEqual(doc);
    // The same document again: the service answers from its answer store, and the status says so.
    expect(await tab.textContent('#status')).toMatch(/^answered: forces \d+ ms \(stored\) · sensing \d+ ms \(stored\)/);
    await tab.close();
    before = await runs();
    await page.fill('#f-body-rate-pitch', '0 deg/s');
    await settled(before);
  });

  it('stays readable in a narrow window', async () => {
    await page.setViewportSize({ width: 420, height: 900 });
    await page.waitForTimeout(300);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await page.screenshot({ path: join(ARTIFACTS, 'bench-narrow-420.png'), fullPage: true });
    await page.setViewportSize({ width: 1280, height: 800 });
  });

  it('raised no console errors except the refusals the tests provoked', () => {
    const unexpected = consoleErrors.filter((e) => {
      const m = /status of (\d+).*@ (\S+)/.exec(e);
      return !(m && refused.some((r) => r.provoked && r.url === m[2] && String(r.status) === m[1] && (r.status === 400 || r.status === 413) && r.url.includes('/api/v1/')));
    });
    expect(unexpected).toEqual([]);
    expect(refused.filter((r) => !r.provoked)).toEqual([]);
    timings.provokedRefusals = refused.length;
  });
});
