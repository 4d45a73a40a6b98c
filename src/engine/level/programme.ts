// The programme stand-in: what the planned level means when no track is loaded. Our definition:
// on each channel of the pair, independent Gaussian pink noise (equal power per octave) band-limited
// like music by second-order Butterworth filters, a high-pass at 30 Hz and a low-pass at 12 kHz.
// Its long-term C-weighted level at the seat is computed in closed form from the small-signal
// response (an integral over frequency: no random numbers, no render), so every figure and check
// that uses it is deterministic. Its peaks: Gaussian noise stays Gaussian through any linear filter
// (a way's filter, the amplifier), and exceeds 3.89 times its rms on one sample in 10,000 (the
// normal distribution's two-sided tail, any statistics table), so every amplifier channel's peak is
// taken as 3.89 × its rms: a peak factor of 11.8 dB.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import { abs, type Complex } from '../complex.ts';
import { wayFilterAt } from '../filters/way-filter.ts';
import { wayPressure } from '../response/frequency.ts';
import { cWeightingDb } from './weighting.ts';
import { splDbOfMeanSquare } from '../units.ts';

export const PROGRAMME_HIGH_PASS_HZ = 30;
export const PROGRAMME_LOW_PASS_HZ = 12000;
/** Peak over rms of the stand-in on every channel (exceeded one sample in 10,000). */
export const PROGRAMME_PEAK_FACTOR = 3.89;
/** Integration grid: 10 Hz to 24 kHz, 12 points per octave (the band's edges fall far below its level). */
const F_LO = 10;
const F_HI = 24000;
const PER_OCTAVE = 12;

/** |H|^2 of a second-order Butterworth high-pass (fc) and low-pass (fl) at f. */
function bandPower(f: number): number {
  const h = (f / PROGRAMME_HIGH_PASS_HZ) ** 4;
  const l = (f / PROGRAMME_LOW_PASS_HZ) ** 4;
  return (h / (1 + h)) * (1 / (1 + l));
}

/** The grid's points and each one's weight: pink noise puts equal power in equal log-frequency steps. */
const GRID: { f: number; weight: number }[] = (() => {
  const n = Math.ceil(Math.log2(F_HI / F_LO) * PER_OCTAVE);
  const pts: { f: number; weight: number }[] = [];
  for (let k = 0; k <= n; k++) {
    const f = F_LO * 2 ** (k / PER_OCTAVE);
    pts.push({ f, weight: bandPower(f) * (k === 0 || k === n ? 0.5 : 1) });
  }
  const total = pts.reduce((s, p) => s + p.weight, 0);
  for (const p of pts) p.weight /= total;
  return pts;
})();

/** How many speakers a way's programme reaches the seat from, and the power of its input per channel. */
function wayShare(system: SpeakerSystem, way: DriverWay | SpeakerSystem['ways'][number]): { speakers: number; inputPower: number } {
  const firstDriver = system.ways.find((w) => w.kind === 'driver');
  // A mono-sum pair plays its bass way from the channels' mean: independent channels, half the power.
  if (system.listening.channels === 'mono-sum' && way === firstDriver) return { speakers: 2, inputPower: 0.5 };
  return { speakers: 2, inputPower: 1 };
}

/** Long-term C-weighted level at the seat (both speakers) for the stand-in at 1 V rms per channel, dB. */
export function programmeLeqCPerVolt(system: SpeakerSystem): number {
  let ms = 0;
  for (const { f, weight } of GRID) {
    const c2 = 10 ** (cWeightingDb(f) / 10);
    for (const way of system.ways) {
      const { speakers, inputPower } = wayShare(system, way);
      const p: Complex = wayPressure(system, way, f, 1);
      ms += weight * c2 * speakers * inputPower * abs(p) ** 2;
    }
  }
  return splDbOfMeanSquare(ms);
}

/**
 * Channel volts rms of the stand-in for the design's planned level (volts mode: its full-scale
 * peak); `leqCPerVoltDb` is programmeLeqCPerVolt(system) when the caller has it already.
 */
export function programmeVoltsRms(system: SpeakerSystem, leqCPerVoltDb?: number): number {
  const level = system.listening.level;
  if (level.mode === 'volts') return level.voltsFs / PROGRAMME_PEAK_FACTOR;
  return 10 ** ((level.splDb - (leqCPerVoltDb ?? programmeLeqCPerVolt(system))) / 20);
}

/** The stand-in's peak at a driver way's amplifier channel (after its filter), V, for `voltsRms` per channel. */
export function programmePeakVolts(system: SpeakerSystem, way: DriverWay, voltsRms: number): number {
  let power = 0;
  for (const { f, weight } of GRID) power += weight * abs(wayFilterAt(way.filter, 2 * Math.PI * f)) ** 2;
  return PROGRAMME_PEAK_FACTOR * voltsRms * Math.sqrt(power * wayShare(system, way).inputPower);
}

/** A driver way whose amplifier channel cannot give the stand-in's peaks at the planned level. */
export interface AmplifierShortfall {
  way: string;
  /** Peak volts the way's channel needs, and the rail it has. */
  needV: number;
  railV: number;
  /** 20·log10(need/rail), dB. */
  shortDb: number;
}

/** The planned level against the amplifier: each driver way whose channel would clip on the stand-in's peaks. */
export function amplifierShortfalls(system: SpeakerSystem, voltsRms = programmeVoltsRms(system)): AmplifierShortfall[] {
  const rail = system.amplifier.vPeak;
  const out: AmplifierShortfall[] = [];
  for (const way of system.ways) {
    if (way.kind !== 'driver') continue;
    const need = programmePeakVolts(system, way, voltsRms);
    if (need > rail) out.push({ way: way.name, needV: need, railV: rail, shortDb: 20 * Math.log10(need / rail) });
  }
  return out;
}
