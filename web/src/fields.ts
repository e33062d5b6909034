/**
 * The scenario editor's fields, grouped as a user thinks of them: organ, body motion, maneuver,
 * stalk, sense mode, sensor, sampling. A field reads its text from the document and writes it
 * back; the service checks every value (the page does not parse units).
 */
import { getAt, pretty, setAt, type Path } from './doc.js';
import type { Doc, Json } from './types.js';

export type FieldKind = 'text' | 'int' | 'triple' | 'select' | 'check' | 'json';

export interface Field {
  id: string;
  kind: FieldKind;
  label: string;
  /** Paths whose issues are shown beside this field. */
  paths: string[];
  /** Placeholder: an example value with its units (it may depend on the document, e.g. the drive). */
  example?: string | ((doc: Doc) => string);
  help?: string;
  options?: { value: string; label: string }[];
  /** Triple fields: labels of the three parts. */
  parts?: [string, string, string];
  show?: (doc: Doc) => boolean;
  read: (doc: Doc) => string | string[] | boolean;
  write: (doc: Doc, value: string | string[] | boolean) => void;
  /** Write rewrites other fields too (drive, waveform): the editor reloads every field. */
  reshapes?: boolean;
}

export interface Group {
  id: string;
  title: string;
  /** Optional block: toggled on and off as a whole. */
  block?: { path: Path; defaults: () => Json; show?: (doc: Doc) => boolean; label: string };
  /** Issues under this path that no field claims are shown on the group. */
  path: string;
  fields: Field[];
  show?: (doc: Doc) => boolean;
}

const P = (text: string): Path => text.split('.');
const textOf = (v: Json | undefined): string => (v === undefined || v === null ? '' : typeof v === 'string' ? v : typeof v === 'object' ? JSON.stringify(v) : String(v));
const NUMBER = /^\s*[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?\s*$/i;
/** A number when the text is one, else the text itself (the service names what is wrong). */
const numberOr = (t: string): Json => (NUMBER.test(t) ? Number(t) : t);

const rotary = (d: Doc) => getAt(d, ['organ', 'drive']) !== 'linear';
const linear = (d: Doc) => getAt(d, ['organ', 'drive']) === 'linear';

/** A dimensional value typed as a unit string ("7 ug"); empty removes the key. */
function quantity(path: string, label: string, example: string | ((doc: Doc) => string), extra: Partial<Field> = {}): Field {
  const p = P(path);
  return {
    id: path.replace(/\./g, '-'), kind: 'text', label, example, paths: [path],
    read: (d) => textOf(getAt(d, p)),
    write: (d, v) => setAt(d, p, (v as string).trim() === '' ? undefined : (v as string).trim()),
    ...extra,
  };
}

function integer(path: string, label: string, example: string, extra: Partial<Field> = {}): Field {
  const p = P(path);
  return {
    id: path.replace(/\./g, '-'), kind: 'int', label, example, paths: [path],
    read: (d) => textOf(getAt(d, p)),
    write: (d, v) => setAt(d, p, (v as string).trim() === '' ? undefined : numberOr((v as string).trim())),
    ...extra,
  };
}

/** Three plain numbers (a direction) or three quantities (a position), in body axes. */
function triple(path: string, label: string, example: string, asNumbers: boolean, extra: Partial<Field> = {}): Field {
  const p = P(path);
  return {
    id: path.replace(/\./g, '-'), kind: 'triple', label, example, paths: [path], parts: ['x', 'y', 'z'],
    read: (d) => {
      const v = getAt(d, p);
      return Array.isArray(v) ? [0, 1, 2].map((i) => textOf(v[i])) : ['', '', ''];
    },
    write: (d, v) => {
      const parts = (v as string[]).map((s) => s.trim());
      if (!asNumbers && parts.every((s) => s === '')) return setAt(d, p, undefined);
      setAt(d, p, parts.map((s) => (asNumbers ? numberOr(s) : NUMBER.test(s) ? Number(s) : s)));
    },
    ...extra,
  };
}

function jsonField(path: Path, label: string, extra: Partial<Field> = {}): Field {
  return {
    id: `${path.join('-')}-json`, kind: 'json', label, paths: [path.join('.')],
    read: (d) => {
      const v = getAt(d, path);
      return v === undefined ? '' : pretty(v);
    },
    write: (d, v) => setAt(d, path, (v as string).trim() === '' ? undefined : (JSON.parse(v as string) as Json)),
    ...extra,
  };
}

// ---- organ ------------------------------------------------------------------------------------

const ROTARY_ONLY = ['arm', 'rest', 'normal', 'stalk', 'deviation'];
const LINEAR_ONLY = ['driveAxis', 'senseAxis'];
const SHAPE = ['amplitude', 'peakToPeak', 'mean', 'waveform'];
const driveStash: Record<string, Record<string, Json>> = {
  rotary: { arm: '0.9 mm', amplitude: '80 deg', rest: [0, 1, 0], normal: [0.89, 0, 0.45], waveform: 'sine' },
  linear: { amplitude: '6 um', driveAxis: [0, 1, 0], senseAxis: [1, 0, 0], waveform: 'sine' },
};

const driveField: Field = {
  id: 'organ-drive', kind: 'select', label: 'drive', paths: ['organ.drive'], reshapes: true,
  options: [{ value: 'rotary', label: 'rotary (hinged beam)' }, { value: 'linear', label: 'linear (proof mass)' }],
  read: (d) => (linear(d) ? 'linear' : 'rotary'),
  write: (d, v) => {
    const from = linear(d) ? 'linear' : 'rotary';
    if (v === from) return;
    const organ = (getAt(d, ['organ']) ?? {}) as Record<string, Json>;
    const keep: Record<string, Json> = {};
    for (const k of [...(from === 'rotary' ? ROTARY_ONLY : LINEAR_ONLY), ...SHAPE]) {
      if (organ[k] !== undefined) keep[k] = organ[k];
      delete organ[k];
    }
    driveStash[from] = keep;
    Object.assign(organ, driveStash[v as string]);
    organ.drive = v as string;
    setAt(d, ['organ'], organ);
  },
};

type WaveKind = 'sine' | 'triangle' | 'rounded' | 'json';
const waveKind = (d: Doc): WaveKind => {
  const w = getAt(d, ['organ', 'waveform']);
  if (w === undefined || w === 'sine') return 'sine';
  if (w === 'triangle') return 'triangle';
  if (w && typeof w === 'object' && !Array.isArray(w) && 'triangle' in w) return 'rounded';
  return 'json';
};
const periodic = (d: Doc) => waveKind(d) !== 'json';
let amplitudeStash: Record<string, Json> = {};

const waveformField: Field = {
  id: 'organ-waveform', kind: 'select', label: 'stroke waveform', paths: ['organ.waveform'], reshapes: true,
  options: [
    { value: 'sine', label: 'sine' },
    { value: 'triangle', label: 'triangle (rounded reversals)' },
    { value: 'rounded', label: 'triangle, set rounding' },
    { value: 'json', label: 'series or trace (JSON)' },
  ],
  read: waveKind,
  write: (d, v) => {
    const was = waveKind(d);
    const organ = getAt(d, ['organ']) as Record<string, Json>;
    if (v === 'json' && was !== 'json') {
      amplitudeStash = {};
      for (const k of ['amplitude', 'peakToPeak', 'mean']) if (organ[k] !== undefined) amplitudeStash[k] = organ[k] as Json;
      const amp = organ.amplitude ?? '80 deg';
      for (const k of ['amplitude', 'peakToPeak']) delete organ[k];
      organ.waveform = { harmonics: [{ order: 1, cos: 0, sin: amp }] };
      return;
    }
    if (v !== 'json' && was === 'json') {
      Object.assign(organ, Object.keys(amplitudeStash).length ? amplitudeStash : { amplitude: linear(d) ? '6 um' : '80 deg' });
      if (getAt(d, ['organ', 'waveform', 'samples'])) delete organ.mean;
    }
    organ.waveform = v === 'sine' ? 'sine' : v === 'triangle' ? 'triangle' : v === 'rounded' ? { triangle: { rounding: 0.3 } } : (organ.waveform as Json);
  },
};

/** Half stroke or peak-to-peak: one value, two possible keys, never both. */
const strokeField: Field = {
  id: 'organ-amplitude', kind: 'text', label: 'stroke', example: (d) => (linear(d) ? '6 um' : '80 deg'), paths: ['organ.amplitude', 'organ.peakToPeak'],
  help: 'half stroke (amplitude) or whole stroke (peak to peak), chosen beside',
  show: periodic,
  read: (d) => textOf(getAt(d, ['organ', 'peakToPeak']) ?? getAt(d, ['organ', 'amplitude'])),
  write: (d, v) => {
    const key = getAt(d, ['organ', 'peakToPeak']) !== undefined ? 'peakToPeak' : 'amplitude';
    setAt(d, ['organ', key], (v as string).trim() === '' ? undefined : (v as string).trim());
  },
};

const strokeKindField: Field = {
  id: 'organ-stroke-kind', kind: 'select', label: 'stroke given as', paths: [],
  options: [{ value: 'amplitude', label: 'half stroke (±)' }, { value: 'peakToPeak', label: 'peak to peak' }],
  show: periodic,
  read: (d) => (getAt(d, ['organ', 'peakToPeak']) !== undefined ? 'peakToPeak' : 'amplitude'),
  write: (d, v) => {
    const other = v === 'amplitude' ? 'peakToPeak' : 'amplitude';
    const value = getAt(d, ['organ', other]);
    if (value === undefined) return;
    setAt(d, ['organ', other], undefined);
    setAt(d, ['organ', v as string], value);
  },
};

const organ: Group = {
  id: 'organ', title: 'Organ', path: 'organ',
  fields: [
    driveField,
    quantity('organ.mass', 'mass', '7 ug', { help: 'moving (end) mass' }),
    quantity('organ.arm', 'arm length', '0.9 mm', { show: rotary, help: 'hinge to the centre of the mass' }),
    quantity('organ.frequency', 'beat frequency', '170 Hz'),
    waveformField,
    strokeField,
    strokeKindField,
    { ...integer('organ.waveform.triangle.rounding', 'rounding', '0.3', { show: (d) => waveKind(d) === 'rounded', help: 'share of the beat the reversals take (0–1]' }), kind: 'text' },
    jsonField(['organ', 'waveform'], 'waveform (JSON)', { show: (d) => waveKind(d) === 'json', id: 'organ-waveform-json', help: '{ "harmonics": [{ "order", "cos", "sin" }] } or { "samples": { "time", "angle" }, "harmonics": K }' }),
    quantity('organ.mean', 'mean stroke', (d) => (linear(d) ? '0 um' : '0 deg'), { show: (d) => getAt(d, ['organ', 'waveform', 'samples']) === undefined }),
    triple('organ.rest', 'arm at rest', '0, 1, 0', true, { show: rotary, help: 'unit direction in body axes (x fwd, y right, z down)' }),
    triple('organ.normal', 'stroke-plane normal', '0.89, 0, 0.45', true, { show: rotary, help: 'perpendicular to the arm at rest' }),
    triple('organ.driveAxis', 'drive axis', '0, 1, 0', true, { show: linear }),
    triple('organ.senseAxis', 'sense axis', '1, 0, 0', true, { show: linear, help: 'perpendicular to the drive axis' }),
    triple('organ.hinge', 'hinge position', '0.3 mm', false, { help: 'from the body reference point, body axes' }),
    { id: 'organ-mirror', kind: 'check', label: 'add the mirror organ (left–right pair)', paths: ['organ.mirror'], read: (d) => getAt(d, ['organ', 'mirror']) !== false, write: (d, v) => setAt(d, ['organ', 'mirror'], v as boolean) },
  ],
};

// ---- body -------------------------------------------------------------------------------------

const gravityOn = (d: Doc) => { const g = getAt(d, ['body', 'gravity']); return g !== undefined && g !== false; };

const body: Group = {
  id: 'body', title: 'Body motion', path: 'body',
  fields: [
    quantity('body.rate.roll', 'roll rate', '0 deg/s', { help: 'p, about x (forward)' }),
    quantity('body.rate.pitch', 'pitch rate', '0 deg/s', { help: 'q, about y (right)' }),
    quantity('body.rate.yaw', 'yaw rate', '200 deg/s', { help: 'r, about z (down); positive turns the nose right' }),
    triple('body.acceleration', 'linear acceleration', '0 m/s^2', false),
    { id: 'body-gravity', kind: 'check', label: 'include gravity (9.80665 m/s²)', paths: ['body.gravity'], read: gravityOn, write: (d, v) => setAt(d, ['body', 'gravity'], v ? true : undefined), reshapes: true },
    quantity('body.attitude.roll', 'attitude roll', '0 deg', { show: gravityOn }),
    quantity('body.attitude.pitch', 'attitude pitch', '0 deg', { show: gravityOn }),
  ],
};

// ---- maneuver ---------------------------------------------------------------------------------

type ProfileKind = 'none' | 'constant' | 'pulse' | 'sine' | 'json';
const profileKind = (d: Doc, axis: string): ProfileKind => {
  const v = getAt(d, ['body', 'maneuver', axis]);
  if (v === undefined) return 'none';
  if (typeof v === 'string' || typeof v === 'number') return 'constant';
  if (v && typeof v === 'object' && !Array.isArray(v)) {
    if ('pulse' in v) return 'pulse';
    if ('sine' in v) return 'sine';
  }
  return 'json';
};
const PROFILE_DEFAULTS: Record<ProfileKind, Json | undefined> = {
  none: undefined, constant: '100 deg/s',
  pulse: { pulse: { peak: '1000 deg/s', duration: '60 ms', start: '40 ms' } },
  sine: { sine: { amplitude: '200 deg/s', frequency: '12 Hz', phase: '0 deg' } },
  json: { samples: { time: [0, 0.1, 0.2], rate: [0, 5, 0] } },
};

const profileFields = (axis: 'roll' | 'pitch' | 'yaw'): Field[] => {
  const is = (k: ProfileKind) => (d: Doc) => profileKind(d, axis) === k;
  const base = `body.maneuver.${axis}`;
  return [
    {
      id: `maneuver-${axis}-kind`, kind: 'select', label: `${axis} profile`, paths: [], reshapes: true,
      options: [{ value: 'none', label: 'none' }, { value: 'constant', label: 'constant' }, { value: 'pulse', label: 'pulse (bell)' }, { value: 'sine', label: 'sine' }, { value: 'json', label: 'samples or sum (JSON)' }],
      read: (d) => profileKind(d, axis),
      write: (d, v) => setAt(d, ['body', 'maneuver', axis], PROFILE_DEFAULTS[v as ProfileKind]),
    },
    quantity(base, `${axis} rate`, '100 deg/s', { show: is('constant'), id: `maneuver-${axis}-constant` }),
    quantity(`${base}.pulse.peak`, `${axis} peak`, '1500 deg/s', { show: is('pulse') }),
    quantity(`${base}.pulse.duration`, `${axis} pulse length`, '60 ms', { show: is('pulse') }),
    quantity(`${base}.pulse.start`, `${axis} pulse start`, '40 ms', { show: is('pulse') }),
    quantity(`${base}.sine.amplitude`, `${axis} amplitude`, '200 deg/s', { show: is('sine') }),
    quantity(`${base}.sine.frequency`, `${axis} frequency`, '12 Hz', { show: is('sine') }),
    quantity(`${base}.sine.phase`, `${axis} phase`, '0 deg', { show: is('sine') }),
    jsonField(['body', 'maneuver', axis], `${axis} profile (JSON)`, { show: is('json'), id: `maneuver-${axis}-json` }),
  ];
};

const maneuver: Group = {
  id: 'maneuver', title: 'Maneuver (turn)', path: 'body.maneuver',
  block: { path: ['body', 'maneuver'], label: 'run a maneuver', defaults: () => ({ duration: '200 ms', yaw: { pulse: { peak: '1500 deg/s', duration: '60 ms', start: '40 ms' } } }) },
  fields: [quantity('body.maneuver.duration', 'duration', '200 ms'), ...profileFields('roll'), ...profileFields('pitch'), ...profileFields('yaw')],
};

// ---- stalk, sense mode, sensor, sampling ------------------------------------------------------

const stalk: Group = {
  id: 'stalk', title: 'Stalk', path: 'organ.stalk', show: rotary,
  block: { path: ['organ', 'stalk'], label: 'model the stalk (strain at its base)', defaults: () => ({ length: '0.8 mm', outerRadius: '40 um', innerRadius: '30 um', modulus: '5 GPa', mass: '1 ug' }) },
  fields: [
    quantity('organ.stalk.length', 'length', '0.8 mm'),
    quantity('organ.stalk.outerRadius', 'outer radius', '40 um'),
    quantity('organ.stalk.innerRadius', 'inner radius', '30 um'),
    quantity('organ.stalk.modulus', "Young's modulus", '5 GPa'),
    quantity('organ.stalk.mass', 'stalk mass', '1 ug'),
  ],
};

const senseMode: Group = {
  id: 'senseMode', title: 'Sense mode', path: 'organ.senseMode',
  block: { path: ['organ', 'senseMode'], label: 'add a sense-mode resonance', defaults: () => ({ frequency: '1.1 kHz', quality: 15, mass: '7 ug' }) },
  fields: [
    quantity('organ.senseMode.frequency', 'natural frequency', '1.1 kHz'),
    quantity('organ.senseMode.quality', 'quality factor Q', '15'),
    quantity('organ.senseMode.mass', 'effective mass', '7 ug'),
  ],
};

const integrationField: Field = {
  id: 'sensor-integration', kind: 'text', label: 'integration', example: '20 ms or 10 beats', paths: ['sensor.integration'],
  help: 'a time, or “n beats”',
  read: (d) => {
    const v = getAt(d, ['sensor', 'integration']);
    return v && typeof v === 'object' && !Array.isArray(v) && 'beats' in v ? `${textOf(v.beats)} beats` : textOf(v);
  },
  write: (d, v) => {
    const t = (v as string).trim();
    const m = /^([-+]?\d+(?:\.\d+)?)\s*beats?$/i.exec(t);
    setAt(d, ['sensor', 'integration'], t === '' ? undefined : m ? { beats: Number(m[1]) } : t);
  },
};

const sensor: Group = {
  id: 'sensor', title: 'Sensor and detection', path: 'sensor',
  block: { path: ['sensor'], label: 'set noise and detection', defaults: () => ({ temperature: '300 K', readoutNoise: '2e-10 N / Hz^0.5', integration: '20 ms', threshold: 1 }) },
  fields: [
    quantity('sensor.temperature', 'temperature', '300 K'),
    quantity('sensor.readoutNoise', 'readout noise density', '2e-10 N / Hz^0.5', { help: 'force, strain or displacement per √Hz' }),
    integrationField,
    quantity('sensor.threshold', 'detection threshold (SNR)', '1'),
    quantity('sensor.misalignment', 'sensing-axis misalignment', '0.5 deg'),
    quantity('sensor.phaseError', 'reference phase error', '1 deg'),
  ],
};

const sampling: Group = {
  id: 'sampling', title: 'Sampling', path: 'sampling',
  fields: [
    integer('sampling.pointsPerBeat', 'points per beat', '256'),
    integer('sampling.beats', 'beats', '1'),
    integer('sampling.harmonics', 'harmonic orders', '8'),
    {
      id: 'output-path', kind: 'select', label: 'computation path', paths: ['output.path'],
      options: [{ value: 'auto', label: 'auto (closed form where it applies)' }, { value: 'closed-form', label: 'closed form' }, { value: 'sampled', label: 'sampled' }],
      read: (d) => textOf(getAt(d, ['output', 'path'])) || 'auto',
      write: (d, v) => setAt(d, ['output', 'path'], v === 'auto' ? undefined : (v as string)),
    },
  ],
};

export const GROUPS: Group[] = [organ, body, maneuver, stalk, senseMode, sensor, sampling];
