// What the room does to the design's curve at the seat: the sum's SPL with and without the room,
// the lowest modes and the Schroeder frequency, and the numbers the Client sheet's sentence uses.
import type { SpeakerSystem } from '../system.ts';
import { roomGainDb, roomModel, type RoomMode } from './modes.ts';

/** Modes listed in the analysis. */
export const LISTED_MODES = 12;
/** The band the room's summary figures describe, Hz. */
export const ROOM_BAND_HZ: [number, number] = [20, 200];

export interface RoomAnalysis {
  schroederHz: number;
  t60S: number;
  /** Where the modes hand over to the diffuse field, Hz. */
  transitionHz: number;
  /** Modes summed (the (0,0,0) mode included). */
  modeCount: number;
  /** The lowest modes, (0,0,0) left out. */
  modes: RoomMode[];
  curves: {
    freqHz: Float64Array;
    /** The sum at the seat in the room (the first speaker), dB SPL at the analysis drive. */
    splDb: Float64Array;
    /** The same without the room (the design's own space), dB SPL. */
    freeSplDb: Float64Array;
  };
  /** Over ROOM_BAND_HZ: the room's largest rise and deepest dip against the free curve, dB, and where. */
  peakDb: number;
  peakHz: number;
  dipDb: number;
  dipHz: number;
}

export function roomAnalysis(system: SpeakerSystem, freqHz: Float64Array, freeSplDb: Float64Array): RoomAnalysis | undefined {
  const model = roomModel(system.listening, system.air);
  if (!model) return undefined;
  const path = model.paths[0];
  const splDb = new Float64Array(freqHz.length);
  let peakDb = -Infinity,
    peakHz = 0,
    dipDb = Infinity,
    dipHz = 0;
  freqHz.forEach((f, k) => {
    const g = roomGainDb(path, f);
    splDb[k] = freeSplDb[k] + g;
    if (f < ROOM_BAND_HZ[0] || f > ROOM_BAND_HZ[1]) return;
    if (g > peakDb) [peakDb, peakHz] = [g, f];
    if (g < dipDb) [dipDb, dipHz] = [g, f];
  });
  return {
    schroederHz: model.schroederHz,
    t60S: model.reverb.t60,
    transitionHz: path.transitionHz,
    modeCount: model.modes.length,
    modes: model.modes.filter((m) => m.hz > 0).slice(0, LISTED_MODES),
    curves: { freqHz, splDb, freeSplDb },
    peakDb,
    peakHz,
    dipDb,
    dipHz,
  };
}
