/**
 * Plain shapes of the API answers the page draws (design §9). Only the fields the page reads are
 * named; the page never computes physics from them, it draws and formats them.
 */
export type Vec3 = [number, number, number];

export interface Issue {
  path: string;
  message: string;
  limit?: string;
}

export interface Line {
  component: string;
  axis: string;
  order: number;
  amplitude: number;
  phase: number;
}

export interface OrganSeries {
  time: number[];
  stroke: number[];
  deviation?: number[];
  loads: Record<string, Record<string, number[]>>;
}

export interface OrganAnswer {
  side: string;
  role: 'specified' | 'mirror';
  frame: Record<string, Vec3>;
  harmonics: Line[];
  series?: OrganSeries;
}

/** The normalised SI scenario as the answer returns it (only what the sketch and labels read). */
export interface SiScenario {
  organ: {
    drive: 'rotary' | 'linear';
    mass: number;
    frequency: number;
    arm?: number;
    amplitude?: number;
    peakToPeak?: number;
    mean?: number;
    hinge: Vec3;
    mirror: boolean;
    rest?: Vec3;
    normal?: Vec3;
    driveAxis?: Vec3;
    senseAxis?: Vec3;
    stalk?: { length: number };
  };
  sampling: { pointsPerBeat: number; beats: number; harmonics: number };
  body?: { rate?: { roll: number; pitch: number; yaw: number } };
}

export interface ForcesAnswer {
  version: string;
  path: string;
  scenario: SiScenario;
  units: Record<string, string>;
  warnings: string[];
  organs: OrganAnswer[];
}

export type Json = null | boolean | number | string | Json[] | { [k: string]: Json };
export type Doc = { [k: string]: Json };
