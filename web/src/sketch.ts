/**
 * A small sketch of the geometry: body axes (ISO 1151-1: x forward, y right, z down), the stroke
 * plane, the arm at rest and the swept stroke, the plane's normal, for both organs. Orthographic
 * projection; drawing only (the frame vectors come from the service's answer).
 */
import { s } from './dom.js';
import type { Vec3 } from './types.js';

export interface SketchOrgan {
  side: string;
  role: string;
  hinge: Vec3;
  /** Rotary: arm at rest a0, tangential t0, normal n. Linear: drive d, sense s, cross. */
  e1: Vec3;
  e2: Vec3;
  e3: Vec3;
}

export interface SketchGeometry {
  drive: 'rotary' | 'linear';
  organs: SketchOrgan[];
  /** Rotary: arm length (m). */
  arm: number;
  /** Rotary: the stroke angles swept, [lowest, highest] (rad). */
  strokeRange?: [number, number];
  /** Set when the typed directions are refused (drawn as typed, in the warning colour). */
  problem?: string;
}

export type ViewName = 'oblique' | 'top' | 'front' | 'side';
const VIEWS: Record<ViewName, { az: number; el: number }> = {
  oblique: { az: 35, el: 28 },
  top: { az: 0, el: 90 },
  front: { az: 180, el: 0 },
  side: { az: -90, el: 0 },
};

const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const add = (a: Vec3, b: Vec3): Vec3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
const mul = (a: Vec3, k: number): Vec3 => [a[0] * k, a[1] * k, a[2] * k];

/** Camera basis in body axes: right, up, and toward the viewer. */
function camera(view: ViewName): { right: Vec3; up: Vec3; toward: Vec3 } {
  const { az, el } = VIEWS[view];
  const A = (az * Math.PI) / 180, E = (el * Math.PI) / 180;
  const rz = (v: Vec3): Vec3 => [Math.cos(A) * v[0] - Math.sin(A) * v[1], Math.sin(A) * v[0] + Math.cos(A) * v[1], v[2]];
  // Behind the body, raised by the elevation, then turned about the body's z axis.
  const toward = rz([-Math.cos(E), 0, -Math.sin(E)]);
  const up = rz([Math.sin(E), 0, -Math.cos(E)]);
  const right = rz([0, 1, 0]);
  return { right, up, toward };
}

export function drawSketch(svg: SVGSVGElement, g: SketchGeometry, view: ViewName): void {
  const cam = camera(view);
  // Rotary: hinge plus arm. Linear: the drive bar (±0.45 extent about the mass) must end inside the
  // body axes (1.1 extent) and their labels, so the mass sits at 0.55 extent at most.
  const reach = (o: SketchGeometry['organs'][number]) => (g.drive === 'rotary' ? Math.hypot(...o.hinge) + g.arm : Math.hypot(...o.hinge) / 0.55);
  const extent = Math.max(g.arm || 0, ...g.organs.map(reach)) || 1e-3;
  const unit = 118 / extent; // 1 extent → 118 px
  const P = (p: Vec3): [number, number] => [dot(p, cam.right) * unit, -dot(p, cam.up) * unit];
  const pts = (list: Vec3[]) => list.map((p) => P(p).map((v) => v.toFixed(1)).join(',')).join(' ');
  const items: { depth: number; el: SVGElement }[] = [];
  const add3 = (depth: number, el: SVGElement) => items.push({ depth, el });

  // Body footprint in the x–y plane and the axes.
  const body: Vec3[] = Array.from({ length: 48 }, (_, i) => {
    const t = (2 * Math.PI * i) / 48;
    return [0.75 * extent * Math.cos(t), 0.32 * extent * Math.sin(t), 0];
  });
  add3(-1e9, s('polygon', { points: pts(body), class: 'sk-body' }));
  const axisLen = 1.1 * extent;
  for (const [v, name, cls] of [[[1, 0, 0], 'x fwd', 'sk-ax-x'], [[0, 1, 0], 'y right', 'sk-ax-y'], [[0, 0, 1], 'z down', 'sk-ax-z']] as [Vec3, string, string][]) {
    const [x1, y1] = P([0, 0, 0]);
    const [x2, y2] = P(mul(v, axisLen));
    const [lx, ly] = P(mul(v, axisLen * 1.12));
    add3(dot(mul(v, axisLen / 2), cam.toward), s('g', { class: `sk-axis ${cls}` }, s('line', { x1, y1, x2, y2, 'marker-end': 'url(#sk-arrow)' }), s('text', { x: lx, y: ly, 'text-anchor': 'middle', 'dominant-baseline': 'middle' }, name)));
  }

  for (const o of g.organs) {
    const cls = `sk-organ sk-${o.role}${g.problem ? ' sk-problem' : ''}`;
    const [hx, hy] = P(o.hinge);
    if (g.drive === 'rotary') {
      const L = g.arm || extent * 0.6;
      const on = (phi: number): Vec3 => add(o.hinge, add(mul(o.e1, L * Math.cos(phi)), mul(o.e2, L * Math.sin(phi))));
      const disc = Array.from({ length: 64 }, (_, i) => on((2 * Math.PI * i) / 64));
      const depth = dot(o.hinge, cam.toward);
      const [lo, hi] = g.strokeRange ?? [0, 0];
      const from = Math.max(lo, hi - 2 * Math.PI);
      const sweep = hi > from ? [o.hinge, ...Array.from({ length: 33 }, (_, i) => on(from + ((hi - from) * i) / 32))] : [];
      const tip = on(0);
      const [tx, ty] = P(tip);
      const [nx, ny] = P(add(o.hinge, mul(o.e3, 0.7 * L)));
      const [lx, ly] = P(add(o.hinge, mul(o.e3, 0.82 * L)));
      add3(depth, s('g', { class: cls, 'data-role': o.role },
        s('polygon', { points: pts(disc), class: 'sk-plane' }),
        ...(sweep.length ? [s('polygon', { points: pts(sweep), class: 'sk-sweep' })] : []),
        s('line', { x1: hx, y1: hy, x2: tx, y2: ty, class: 'sk-arm' }),
        s('circle', { cx: tx, cy: ty, r: 4.5, class: 'sk-mass' }),
        s('text', { x: tx, y: ty - 8, class: 'sk-side', 'text-anchor': 'middle' }, o.side),
        s('line', { x1: hx, y1: hy, x2: nx, y2: ny, class: 'sk-normal', 'marker-end': 'url(#sk-arrow-n)' }),
        s('text', { x: lx, y: ly, class: 'sk-label' }, 'n'),
        s('circle', { cx: hx, cy: hy, r: 2.5, class: 'sk-hinge' }),
      ));
    } else {
      const L = extent * 0.45;
      const [a1, b1] = P(add(o.hinge, mul(o.e1, -L)));
      const [a2, b2] = P(add(o.hinge, mul(o.e1, L)));
      const [sx, sy] = P(add(o.hinge, mul(o.e2, 0.8 * L)));
      const [lx, ly] = P(add(o.hinge, mul(o.e2, 0.95 * L)));
      add3(dot(o.hinge, cam.toward), s('g', { class: cls, 'data-role': o.role },
        s('line', { x1: a1, y1: b1, x2: a2, y2: b2, class: 'sk-drive' }),
        s('line', { x1: hx, y1: hy, x2: sx, y2: sy, class: 'sk-normal', 'marker-end': 'url(#sk-arrow-n)' }),
        s('text', { x: lx, y: ly, class: 'sk-label' }, 's'),
        s('rect', { x: hx - 5, y: hy - 5, width: 10, height: 10, class: 'sk-mass' }),
        s('text', { x: hx, y: hy - 9, class: 'sk-side', 'text-anchor': 'middle' }, o.side),
      ));
    }
  }

  items.sort((a, b) => a.depth - b.depth);
  const defs = s('defs', {},
    s('marker', { id: 'sk-arrow', viewBox: '0 0 10 10', refX: 9, refY: 5, markerWidth: 7, markerHeight: 7, orient: 'auto-start-reverse' }, s('path', { d: 'M0,0 L10,5 L0,10 z', class: 'sk-arrowhead' })),
    s('marker', { id: 'sk-arrow-n', viewBox: '0 0 10 10', refX: 9, refY: 5, markerWidth: 7, markerHeight: 7, orient: 'auto-start-reverse' }, s('path', { d: 'M0,0 L10,5 L0,10 z', class: 'sk-arrowhead-n' })),
  );
  svg.replaceChildren(defs, ...items.map((i) => i.el));
  if (g.problem) svg.append(s('text', { x: -140, y: 150, class: 'sk-problem-text' }, g.problem));
  svg.setAttribute('viewBox', '-160 -160 320 320');
  svg.dataset.geometry = JSON.stringify({ drive: g.drive, organs: g.organs.map((o) => ({ role: o.role, e3: o.e3, e1: o.e1 })), problem: g.problem ?? null });
}
