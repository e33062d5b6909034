/** Three-vectors as plain tuples, for constant geometry (series use Float64Array). */
export type Vec3 = [number, number, number];

export const dot = (a: Vec3, b: Vec3): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];

export const cross = (a: Vec3, b: Vec3): Vec3 => [
  a[1] * b[2] - a[2] * b[1],
  a[2] * b[0] - a[0] * b[2],
  a[0] * b[1] - a[1] * b[0],
];

export const scale = (a: Vec3, s: number): Vec3 => [a[0] * s, a[1] * s, a[2] * s];

export const add = (a: Vec3, b: Vec3): Vec3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];

export const norm = (a: Vec3): number => Math.hypot(a[0], a[1], a[2]);

export const unit = (a: Vec3): Vec3 => scale(a, 1 / norm(a));

/** Reflection across the body's x–z plane (y → −y): the mirror organ's geometry. */
export const mirrorY = (a: Vec3): Vec3 => [a[0], -a[1], a[2]];
