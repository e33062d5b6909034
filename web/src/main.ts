/**
 * The bench page: a scenario editor on the left, the service's answers drawn on the right.
 * Every number shown comes from the service (POST /api/v1/...); the page formats and draws.
 */
import 'uplot/dist/uPlot.min.css';
import { get, post, postText, type Reply } from './api.js';
import { getAt } from './doc.js';
import { byId, h } from './dom.js';
import { Editor } from './editor.js';
import { curlRequest, download, pythonRequest } from './exporting.js';
import { eng, RAD_TO_DEG } from './format.js';
import { plotRecords, resizePlots } from './plots/base.js';
import { drawLoads } from './plots/loads.js';
import { drawSpectrum } from './plots/spectrum.js';
import { type AxisSensing, BODY_AXES, type BodyAxis, drawDetection, type SensingAnswer, type SweepAnswer, sweepRequests } from './plots/snr.js';
import { drawTurn, type TurnAnswer } from './plots/turn.js';
import { loadLocal, readHash, saveLocal, writeHash } from './share.js';
import { drawSketch, type SketchGeometry, type ViewName } from './sketch.js';
import type { Doc, ForcesAnswer, Issue, Vec3 } from './types.js';


interface Bench {
  version: string;
  /** Milestones of the first render (ms since navigation start). */
  marks: Record<string, number>;
  runs: number;
  idle: boolean;
  firstRenderMs?: number;
  answers: { forces?: ForcesAnswer; sensing?: SensingAnswer; sweeps?: Partial<Record<BodyAxis, SweepAnswer>>; turn?: TurnAnswer };
  issues: Issue[];
  plots: typeof plotRecords;
  doc: () => Doc;
  timings: Record<string, number>;
  /** Which of the timed answers the service took from its answer store. */
  kept: Set<string>;
}

const FALLBACK: Doc = {
  organ: { drive: 'rotary', mass: '7 ug', arm: '0.9 mm', frequency: '170 Hz', amplitude: '80 deg', waveform: 'sine', rest: [0, 1, 0], normal: [0.89, 0, 0.45], hinge: [0, 0, 0], mirror: true },
  body: { rate: { roll: '0 deg/s', pitch: '0 deg/s', yaw: '200 deg/s' } },
  sampling: { pointsPerBeat: 256, beats: 1, harmonics: 8 },
};
const DEFAULT_EXAMPLE = 'fly-tilted-stroke';
const DEBOUNCE_MS = 250;

const bench: Bench = {
  version: __BEATFORCE_VERSION__, marks: { script: performance.now() }, runs: 0, idle: false, answers: {}, issues: [], plots: plotRecords, doc: () => editor.current, timings: {}, kept: new Set(),
};
(window as unknown as { __bench: Bench }).__bench = bench;

const ui = {
  example: byId<HTMLSelectElement>('example'),
  exampleNote: byId('example-note'),
  busy: byId('busy'),
  status: byId('status'),
  banner: byId('banner'),
  results: byId('results'),
  axis: byId<HTMLSelectElement>('axis'),
  organ: byId<HTMLSelectElement>('spectrum-organ'),
  view: byId<HTMLSelectElement>('sketch-view'),
  sketch: byId('sketch') as unknown as SVGSVGElement,
  sketchNote: byId('sketch-note'),
  summary: byId('summary'),
  loads: byId('loads'),
  loadsNote: byId('loads-note'),
  spectrum: byId('spectrum'),
  spectrumNote: byId('spectrum-note'),
  detection: byId('detection'),
  detectionNote: byId('detection-note'),
  turnCard: byId('card-turn'),
  turn: byId('turn'),
  turnNote: byId('turn-note'),
  dialog: byId<HTMLDialogElement>('request-dialog'),
  curl: byId<HTMLTextAreaElement>('request-curl'),
  python: byId<HTMLTextAreaElement>('request-python'),
};

byId('editor').addEventListener('submit', (e) => e.preventDefault());
const editor = new Editor(byId('editor'), () => schedule());
let timer: ReturnType<typeof setTimeout> | undefined;
let inflight: AbortController | undefined;
let runId = 0;

function schedule(): void {
  bench.idle = false;
  clearTimeout(timer);
  timer = setTimeout(() => void run(), DEBOUNCE_MS);
}

function setBusy(on: boolean, text = ''): void {
  ui.results.setAttribute('aria-busy', String(on));
  document.body.classList.toggle('busy', on);
  ui.busy.hidden = !on;
  if (text) ui.status.textContent = text;
}

const ALL_AXES = { rotary: ['x', 'y', 'z', 'radial', 'tangential', 'normal'], linear: ['x', 'y', 'z', 'drive', 'sense', 'cross'] } as const;
const AXIS_LABEL: Record<string, string> = { x: 'body x (forward)', y: 'body y (right)', z: 'body z (down)', radial: 'organ radial', tangential: 'organ tangential', normal: 'organ normal', drive: 'organ drive', sense: 'organ sense', cross: 'organ cross' };

/** Fill the axis choice for the drive; keep the chosen axis when it still exists. */
function syncAxes(drive: 'rotary' | 'linear', wanted?: string): void {
  const axes = ALL_AXES[drive];
  const keep = wanted ?? ui.axis.value;
  if ([...ui.axis.options].map((o) => o.value).join() !== axes.join()) ui.axis.replaceChildren(...axes.map((a) => h('option', { value: a }, AXIS_LABEL[a] ?? a)));
  ui.axis.value = (axes as readonly string[]).includes(keep) ? keep : drive === 'rotary' ? 'normal' : 'sense';
}

/** The stroke angles the organ sweeps: from the answer's stroke series, else from its amplitude. */
function strokeRange(a: ForcesAnswer): [number, number] | undefined {
  const stroke = a.organs[0]?.series?.stroke;
  if (stroke?.length) return [Math.min(...stroke), Math.max(...stroke)];
  const o = a.scenario.organ;
  const half = o.amplitude ?? (o.peakToPeak === undefined ? undefined : o.peakToPeak / 2);
  return half === undefined ? undefined : [(o.mean ?? 0) - half, (o.mean ?? 0) + half];
}

function sketchFromAnswer(a: ForcesAnswer): SketchGeometry {
  const o = a.scenario.organ;
  const names = o.drive === 'rotary' ? ['radial', 'tangential', 'normal'] : ['drive', 'sense', 'cross'];
  const hinge = o.hinge;
  return {
    drive: o.drive,
    arm: o.arm ?? 0,
    strokeRange: strokeRange(a),
    organs: a.organs.map((org) => ({
      side: org.side, role: org.role,
      hinge: (org.role === 'mirror' ? [hinge[0], -hinge[1], hinge[2]] : hinge) as Vec3,
      e1: org.frame[names[0] as string] as Vec3, e2: org.frame[names[1] as string] as Vec3, e3: org.frame[names[2] as string] as Vec3,
    })),
  };
}

/** When the service refuses the directions, draw them as typed so the mistake is visible. */
function sketchFromDoc(doc: Doc, last: ForcesAnswer | undefined, issues: Issue[]): SketchGeometry | undefined {
  const rotaryDoc = getAt(doc, ['organ', 'drive']) !== 'linear';
  const [k1, k2] = rotaryDoc ? ['rest', 'normal'] : ['driveAxis', 'senseAxis'];
  const vec = (k: string): Vec3 | undefined => {
    const v = getAt(doc, ['organ', k]);
    if (!Array.isArray(v) || v.length !== 3 || !v.every((x) => typeof x === 'number')) return undefined;
    const n = Math.hypot(...(v as number[]));
    return n > 0 ? ((v as number[]).map((x) => x / n) as Vec3) : undefined;
  };
  const a = vec(k1 as string), b = vec(k2 as string);
  const bad = issues.find((i) => i.path.startsWith(`organ.${k1}`) || i.path.startsWith(`organ.${k2}`));
  if (!a || !b || !bad) return last ? sketchFromAnswer(last) : undefined;
  const e2: Vec3 = rotaryDoc ? [b[1] * a[2] - b[2] * a[1], b[2] * a[0] - b[0] * a[2], b[0] * a[1] - b[1] * a[0]] : b;
  const hinge = (last?.scenario.organ.hinge ?? [0, 0, 0]) as Vec3;
  return {
    drive: rotaryDoc ? 'rotary' : 'linear', arm: last?.scenario.organ.arm ?? 9e-4, strokeRange: last ? strokeRange(last) : undefined,
    organs: [{ side: 'as typed', role: 'specified', hinge, e1: a, e2, e3: rotaryDoc ? b : e2 }],
    problem: `organ.${bad.path.replace(/^organ\./, '')} refused: drawn as typed`,
  };
}

function redrawSketch(g: SketchGeometry | undefined): void {
  if (!g) return;
  drawSketch(ui.sketch, g, ui.view.value as ViewName);
  ui.sketchNote.textContent = g.problem
    ? g.problem
    : g.drive === 'rotary'
      ? 'Shaded disc: stroke plane; darker wedge: the swept stroke; arrow n: the plane normal; dot at the end: the mass at zero stroke. Lighter: the mirror organ.'
      : 'Bar: drive axis (stroke not to scale); arrow s: the sense axis. Lighter: the mirror organ.';
}

function drawForces(a: ForcesAnswer): void {
  syncAxes(a.scenario.organ.drive);
  const hasMirror = a.organs.some((o) => o.role === 'mirror');
  ui.organ.querySelector<HTMLOptionElement>('option[value="mirror"]')!.disabled = !hasMirror;
  if (!hasMirror) ui.organ.value = 'specified';
  drawLoads(ui.loads, ui.loadsNote, a, ui.axis.value, () => editor.patch(['output', 'series'], undefined));
  drawSpectrum(ui.spectrum, ui.spectrumNote, a, ui.axis.value, ui.organ.value);
  redrawSketch(sketchFromAnswer(a));
}

function summaryRow(label: string, value: string, cls = ''): HTMLElement {
  return h('div', { class: `readout ${cls}` }, h('dt', {}, label), h('dd', {}, value));
}

/** Whether the scenario's rate about an axis is detected by the organ as specified (its SNR beside it). */
function verdictCell(one: AxisSensing | undefined): HTMLElement {
  if (one?.detectable === null || one?.detectable === undefined) return h('td', { title: 'no rate about this axis, or no noise model' }, '–');
  const snr = typeof one.snr === 'number' ? ` (SNR ${one.snr < 10 ? one.snr.toPrecision(2) : Math.round(one.snr)})` : '';
  return h('td', { class: one.detectable ? 'seen' : 'missed', title: 'SNR at the scenario\'s rate against the threshold' }, `${one.detectable ? 'seen' : 'missed'}${snr}`);
}

const rateText = (r: number | null | undefined): string => (typeof r === 'number' && Number.isFinite(r) ? eng(r * RAD_TO_DEG, 'deg/s') : '–');

function drawSummary(): void {
  const a = bench.answers.forces;
  if (!a) return;
  const spec = a.organs.find((o) => o.role === 'specified') ?? a.organs[0];
  const biggest = (c: string) => spec?.harmonics.filter((l) => l.component === c && l.order > 0).sort((x, y) => y.amplitude - x.amplitude)[0];
  const p = biggest('primary'), c = biggest('coriolis');
  const rows: HTMLElement[] = [
    summaryRow('largest primary line', p ? `${eng(p.amplitude, 'N')} (${p.axis}, k = ${p.order})` : '–'),
    summaryRow('largest Coriolis line', c && c.amplitude > 0 ? `${eng(c.amplitude, 'N')} (${c.axis}, k = ${c.order})` : 'none (no steady body rate)', 'coriolis'),
    summaryRow('lines computed by', `the ${a.path} path`),
  ];
  const parts: HTMLElement[] = [h('dl', { class: 'readouts' }, ...rows)];
  const s = bench.answers.sensing;
  const so = s?.organs.find((o) => o.role === 'specified') ?? s?.organs[0];
  if (s && so) {
    const head = h('tr', {}, h('th', { scope: 'col' }, 'axis'), h('th', { scope: 'col' }, 'best line'), h('th', { scope: 'col' }, 'this turn'), h('th', { scope: 'col' }, 'organ'), h('th', { scope: 'col', title: s.organs.length > 1 ? 'both organs read together' : 'every read line of the one organ read together (no mirror organ)' }, s.organs.length > 1 ? 'pair' : 'all lines'));
    const body = BODY_AXES.map((ax) => {
      const one = so.axes[ax];
      return h('tr', {}, h('th', { scope: 'row' }, ax), h('td', {}, one?.channel ? `${one.channel.axis} k=${one.channel.order}` : '–'), verdictCell(one), h('td', {}, rateText(one?.minimumRate)), h('td', {}, rateText(s.pair?.[ax]?.minimumRate)));
    });
    const read = so.read ? `${so.read.quantity} (${so.read.unit})` : '';
    const noisy = s.organs.some((o) => BODY_AXES.some((ax) => (o.axes[ax]?.noise?.density ?? 0) > 0));
    const caption = noisy ? `smallest detectable rate${read ? ` · reading ${read}` : ''}` : 'best lines; no noise model, so no smallest detectable rate (set one under Sensor and detection)';
    parts.push(h('table', { class: 'min-rates' }, h('caption', {}, caption), h('thead', {}, head), h('tbody', {}, ...body)));
  }
  ui.summary.replaceChildren(...parts);
}

function showBanner(kind: 'error' | 'warning' | '', lines: string[]): void {
  ui.banner.className = kind ? `banner ${kind}` : 'banner';
  ui.banner.hidden = lines.length === 0;
  ui.banner.replaceChildren(...lines.map((l) => h('p', {}, l)));
}

const hasManeuver = (doc: Doc) => getAt(doc, ['body', 'maneuver']) !== undefined;

async function run(): Promise<void> {
  const id = ++runId;
  inflight?.abort();
  const ctl = new AbortController();
  inflight = ctl;
  const doc = editor.current;
  bench.timings = {};
  bench.kept = new Set();
  setBusy(true, 'computing…');
  saveLocal(doc);
  void writeHash(doc, { axis: ui.axis.value, organ: ui.organ.value });
  if (bench.firstRenderMs === undefined) bench.marks.forcesSent = performance.now();
  const f = await post<ForcesAnswer>('forces', doc, ctl.signal);
  if (bench.firstRenderMs === undefined) bench.marks.forcesAnswered = performance.now();
  if (id !== runId) return;
  bench.timings.forces = f.ms;
  if (f.ok && f.kept) bench.kept.add('forces');
  if (!f.ok) return finishWithIssues(f, doc);
  bench.answers.forces = f.answer;
  editor.clearIssues();
  drawForces(f.answer);
  if (hasManeuver(doc)) ui.loadsNote.prepend('These beats are at the steady rate of body.rate; the maneuver is drawn under Maneuver. ');
  if (bench.firstRenderMs === undefined) bench.firstRenderMs = performance.now(); // since navigation start
  const warnings = f.answer.warnings.map((w) => `Warning: ${w}`);
  showBanner(warnings.length ? 'warning' : '', warnings);

  const [sensing, turn] = await Promise.all([
    post<SensingAnswer>('sensing', doc, ctl.signal),
    hasManeuver(doc) ? post<TurnAnswer>('turn', doc, ctl.signal) : Promise.resolve(undefined),
  ]);
  if (id !== runId) return;
  const issues: Issue[] = [];
  const notes: string[] = [...warnings];
  const refused = (r: Reply<unknown> | undefined, what: string) => {
    if (!r || r.ok || r.status === 0) return;
    issues.push(...r.issues);
    if (!r.issues.length) notes.push(`The service refused the ${what} request: ${r.error}`);
  };
  refused(sensing, 'sensing');
  refused(turn, 'turn');
  bench.timings.sensing = sensing.ms;
  if (sensing.ok && sensing.kept) bench.kept.add('sensing');
  bench.answers.sensing = sensing.ok ? sensing.answer : undefined;

  const sweeps: Partial<Record<BodyAxis, SweepAnswer>> = {};
  const problems: string[] = sensing.ok ? [] : [describe(sensing)];
  if (sensing.ok) {
    const requests = sweepRequests(doc, sensing.answer);
    const t = performance.now();
    const replies = await Promise.all(BODY_AXES.map((ax) => (requests[ax] ? post<SweepAnswer>('sweep', requests[ax], ctl.signal) : Promise.resolve(undefined))));
    if (id !== runId) return;
    if (replies.some((r) => r !== undefined)) bench.timings.sweeps = performance.now() - t; // none without a noise model
    if (replies.some((r) => r?.ok) && replies.every((r) => !r || (r.ok && r.kept))) bench.kept.add('sweeps');
    BODY_AXES.forEach((ax, i) => {
      const r = replies[i];
      if (r?.ok) sweeps[ax] = r.answer;
      else if (r && r.status !== 0) problems.push(`${ax} curve: ${describe(r)}`);
    });
  }
  bench.answers.sweeps = sweeps;
  drawDetection(ui.detection, ui.detectionNote, bench.answers.sensing, sweeps, problems, () => editor.patch(['sensor'], { readoutNoise: '2e-10 N / Hz^0.5', integration: '20 ms', threshold: 1 }));
  ui.turnCard.hidden = !turn;
  bench.answers.turn = turn?.ok ? turn.answer : undefined;
  if (!turn) drawTurn(ui.turn, ui.turnNote, undefined, ui.axis.value);
  else {
    bench.timings.turn = turn.ms;
    if (turn.ok && turn.kept) bench.kept.add('turn');
    drawTurn(ui.turn, ui.turnNote, turn.ok ? turn.answer : undefined, ui.axis.value, turn.ok ? undefined : describe(turn));
  }
  drawSummary();
  bench.issues = issues;
  if (issues.length) editor.showIssues(issues);
  showBanner(issues.length ? 'error' : notes.length ? 'warning' : '', issues.length ? ['The service refused part of the scenario (shown beside the fields):', ...notes] : notes);
  done();
}

const describe = (r: Reply<unknown>): string => (r.ok ? '' : r.issues.length ? r.issues.map((i) => `${i.path}: ${i.message}`).join('; ') : r.error);

function finishWithIssues(f: Extract<Reply<ForcesAnswer>, { ok: false }>, doc: Doc): void {
  if (f.status === 0) return;
  bench.issues = f.issues;
  const rest = editor.showIssues(f.issues);
  const n = f.issues.length;
  showBanner('error', [
    n
      ? `The service refused the scenario (${n} ${n === 1 ? 'issue' : 'issues'}, shown beside ${n === 1 ? 'its field' : 'their fields'}). The plots show the last accepted scenario.`
      : f.status < 0 ? `${f.error}. The plots show the last answer.` : `The service refused the request (HTTP ${f.status}): ${f.error}`,
    ...rest.map((i) => `${i.path}: ${i.message}`),
  ]);
  redrawSketch(sketchFromDoc(doc, bench.answers.forces, f.issues));
  done();
}

function done(): void {
  bench.runs++;
  bench.idle = true;
  const t = bench.timings;
  setBusy(false, `answered: ${Object.entries(t).map(([k, v]) => `${k} ${Math.round(v)} ms${bench.kept.has(k) ? ' (stored)' : ''}`).join(' · ')}`);
}

// ---- examples, start-up -----------------------------------------------------------------------

interface ExampleList { examples: { name: string; description: string }[] }
const descriptions = new Map<string, string>();

async function loadExample(name: string, quiet = false): Promise<Doc | undefined> {
  const r = await get<Doc>(`examples/${encodeURIComponent(name)}`);
  if (!r.ok) {
    if (quiet) return undefined;
    showBanner('error', [`Could not load the example ${name}: ${r.error}`]);
    return undefined;
  }
  return r.answer;
}

/** The example the picker should show, whether or not the list has arrived yet. */
let picked = '';
function pick(name: string): void {
  picked = name;
  ui.example.value = [...ui.example.options].some((o) => o.value === name) ? name : '';
}

async function start(): Promise<void> {
  // The example list only fills the picker: the first answer does not wait for it.
  const listed = get<ExampleList>('examples').then((list) => {
    const examples = list.ok ? list.answer.examples : [];
    ui.example.replaceChildren(h('option', { value: '' }, examples.length ? '— pick an example —' : 'no examples'), ...examples.map((e) => h('option', { value: e.name }, e.name)));
    for (const e of examples) descriptions.set(e.name, e.description);
    pick(picked);
    return examples;
  });
  const { doc: fromHash, view } = await readHash();
  if (view.organ) ui.organ.value = view.organ;
  let doc = fromHash ?? loadLocal();
  if (!doc) {
    doc = await loadExample(DEFAULT_EXAMPLE, true);
    if (doc) pick(DEFAULT_EXAMPLE);
    else {
      const first = (await listed)[0]?.name;
      doc = (first ? await loadExample(first) : undefined) ?? FALLBACK;
      if (first) pick(first);
    }
  }
  bench.marks.documentReady = performance.now();
  syncAxes(getAt(doc, ['organ', 'drive']) === 'linear' ? 'linear' : 'rotary', view.axis);
  ui.exampleNote.textContent = typeof doc.description === 'string' ? doc.description : '';
  editor.load(doc);
  await Promise.all([run(), listed]);
}

ui.example.addEventListener('change', async () => {
  const name = ui.example.value;
  if (!name) return;
  picked = name;
  const doc = await loadExample(name);
  if (!doc) return;
  ui.exampleNote.textContent = descriptions.get(name) ?? '';
  editor.load(doc);
  syncAxes(getAt(doc, ['organ', 'drive']) === 'linear' ? 'linear' : 'rotary');
  schedule();
});

ui.axis.addEventListener('change', () => {
  const a = bench.answers.forces;
  if (a) drawForces(a);
  void writeHash(editor.current, { axis: ui.axis.value, organ: ui.organ.value });
});
ui.organ.addEventListener('change', () => {
  const a = bench.answers.forces;
  if (a) drawSpectrum(ui.spectrum, ui.spectrumNote, a, ui.axis.value, ui.organ.value);
  void writeHash(editor.current, { axis: ui.axis.value, organ: ui.organ.value });
});
ui.view.addEventListener('change', () => {
  const a = bench.answers.forces;
  if (a) redrawSketch(sketchFromAnswer(a));
});

// ---- export -----------------------------------------------------------------------------------

const stem = () => {
  const name = getAt(editor.current, ['name']);
  return (typeof name === 'string' && name ? name : 'scenario').replace(/[^A-Za-z0-9_-]+/g, '-');
};

byId('dl-json').addEventListener('click', () => {
  const { forces, sensing, turn } = bench.answers;
  if (!forces) return showBanner('error', ['Nothing to download yet: the scenario has no accepted answer.']);
  // One file (browsers hold back a second download): each answer exactly as the service sent it.
  const answers = { forces, ...(sensing ? { sensing } : {}), ...(turn ? { turn } : {}) };
  download(`${stem()}-answers.json`, `${JSON.stringify(answers, null, 1)}\n`, 'application/json');
});

async function csv(table: 'harmonics' | 'series'): Promise<void> {
  setBusy(true, `preparing the ${table} table…`);
  const r = await postText(`forces?table=${table}`, editor.current, 'text/csv');
  setBusy(false, r.ok ? `${table} table ready` : 'the table could not be made');
  if (!r.ok) return showBanner('error', [`The ${table} table could not be made: ${r.error}`]);
  download(`${stem()}-${table}.csv`, r.text, 'text/csv');
}
byId('dl-csv').addEventListener('click', () => void csv('harmonics'));
byId('dl-series').addEventListener('click', () => void csv('series'));

const routeChoice = byId<HTMLSelectElement>('request-route');
function fillRequests(): void {
  const doc = editor.current;
  ui.curl.value = curlRequest(location.origin, routeChoice.value, doc);
  ui.python.value = pythonRequest(location.origin, routeChoice.value, doc);
}
routeChoice.addEventListener('change', fillRequests);
byId('copy-request').addEventListener('click', () => {
  const doc = editor.current;
  routeChoice.querySelector<HTMLOptionElement>('option[value="turn"]')!.disabled = !hasManeuver(doc);
  routeChoice.value = hasManeuver(doc) ? 'turn' : 'forces';
  fillRequests();
  ui.dialog.showModal();
});
for (const [button, area] of [['copy-curl', ui.curl], ['copy-python', ui.python]] as const) {
  byId(button).addEventListener('click', async () => {
    area.select();
    try {
      await navigator.clipboard.writeText(area.value);
      byId(button).textContent = 'Copied';
    } catch {
      byId(button).textContent = 'Selected: press Ctrl+C';
    }
    setTimeout(() => (byId(button).textContent = 'Copy'), 1500);
  });
}
byId('share').addEventListener('click', async () => {
  const hash = await writeHash(editor.current, { axis: ui.axis.value, organ: ui.organ.value });
  const url = `${location.origin}${location.pathname}${hash}`;
  try {
    await navigator.clipboard.writeText(url);
    ui.status.textContent = 'link to this view copied';
  } catch {
    ui.status.textContent = 'the address bar now holds a link to this view';
  }
});

byId('version').textContent = bench.version;
new ResizeObserver(() => resizePlots()).observe(ui.results);
void start();
