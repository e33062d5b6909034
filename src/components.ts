/**
 * The load components and the axes they are reported on (design §4): one place owns their names
 * and their order in every table and series.
 */
export const COMPONENTS = ['primary', 'centrifugal', 'angularAcceleration', 'coriolis', 'translational', 'gravity', 'total'] as const;
export type Component = (typeof COMPONENTS)[number];

/** Body axes (ISO 1151-1: x forward, y right, z down) then the organ frame. */
export const ROTARY_AXES = ['x', 'y', 'z', 'radial', 'tangential', 'normal'] as const;
export const LINEAR_AXES = ['x', 'y', 'z', 'drive', 'sense', 'cross'] as const;
export type Axis = (typeof ROTARY_AXES)[number] | (typeof LINEAR_AXES)[number];

export const N_COMPONENTS = COMPONENTS.length;
export const N_AXES = 6;
/** Index of the total in COMPONENTS. */
export const TOTAL = N_COMPONENTS - 1;

export const axesOf = (drive: 'rotary' | 'linear'): readonly Axis[] => (drive === 'rotary' ? ROTARY_AXES : LINEAR_AXES);
