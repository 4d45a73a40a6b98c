// Plain-language comparison of two designs, built only from numbers the engine computed.
// A sentence whose inputs are missing is left out rather than guessed.
import { significant } from '../number-text.ts';
import type { Analysis } from '../response/types.ts';
import { PORT_SPEED_LIMIT } from '../response/analyze.ts';
import { roomSentence } from '../room/sentence.ts';

/** What a headroom search on one track found (the same fields as `preheard headroom --json`). */
export interface HeadroomFinding {
  cleanSplDb: number;
  cleanVolts: number;
  /** An event kind, or null when no limit was reached within the search range. */
  firstLimit: string | null;
  firstLimitS: number | null;
  /** The way whose limit it is (null or absent: the summed output, or a one-way design). */
  firstLimitWay?: string | null;
}

export interface VerdictLine {
  id: 'extension' | 'bass' | 'sensitivity' | 'size' | 'headroom' | 'port' | 'delay' | 'limit' | 'room';
  text: string;
}

/** The limit an event kind stands for, as a noun (tables). */
export const LIMIT_WORDS: Record<string, string> = {
  excursion: 'cone travel (Xmax)',
  xlim: 'the suspension limit (Xlim)',
  'radiator-excursion': 'radiator travel',
  'coil-temperature': 'coil heat',
  'port-speed': 'port air speed',
  'amplifier-clip': 'amplifier power',
  compression: 'compression',
  distortion: 'distortion (10 %)',
};

/** What the design does when it reaches that limit, as a verb phrase (sentences). */
export const LIMIT_PHRASES: Record<string, string> = {
  excursion: 'runs out of cone travel (Xmax)',
  xlim: 'reaches the suspension limit (Xlim)',
  'radiator-excursion': 'runs out of radiator travel',
  'coil-temperature': 'heats its coil past the rating',
  'port-speed': 'runs out of port air speed',
  'amplifier-clip': 'runs out of amplifier power',
  compression: 'loses level to compression (over 1 dB from the hot coil, or over 3 dB at the output)',
  distortion: 'distorts to within 20 dB (10 %) of the music',
};

const one = (x: number) => x.toFixed(1);
const hz = (x: number) => (x < 100 ? x.toFixed(1) : x.toFixed(0));
export const clock = (s: number) => `${Math.floor(s / 60)}:${String(Math.floor(s % 60)).padStart(2, '0')}`;

/** The boxes of a design: the one box, or each driver way's box by name. */
function boxText(an: Analysis): string {
  // A tweeter's back chamber holds a few hundredths of a litre: two significant digits there.
  const litres = (l: number) => (l >= 1 ? one(l) : String(Number(l.toPrecision(2))));
  const boxOf = (w: Analysis['way']) => `${w.box.type} ${litres(w.box.vbNet * 1000)} l`;
  if (an.ways.length === 1) return boxOf(an.way);
  return an.ways.map((w) => `${w.way.name} ${boxOf(w.way)}`).join(' and ');
}

function louder(nameA: string, nameB: string, dbA: number, dbB: number, what: string): string {
  const d = dbB - dbA;
  if (Math.abs(d) < 0.5) return `${nameA} and ${nameB} are within 0.5 dB of each other ${what}.`;
  const [hi, lo] = d > 0 ? [nameB, nameA] : [nameA, nameB];
  return `${hi} is ${one(Math.abs(d))} dB louder than ${lo} ${what}.`;
}

export function verdict(
  a: Analysis,
  b: Analysis,
  names: [string, string] = ['A', 'B'],
  headroom?: [HeadroomFinding | null, HeadroomFinding | null],
): VerdictLine[] {
  const [na, nb] = names;
  const fa = a.figures;
  const fb = b.figures;
  const out: VerdictLine[] = [];
  const deeper = fa.f3Hz > fb.f3Hz ? nb : na;
  out.push({
    id: 'extension',
    text:
      `${na} is 3 dB down at ${hz(fa.f3Hz)} Hz (6 dB at ${hz(fa.f6Hz)}, 10 dB at ${hz(fa.f10Hz)} Hz); ` +
      `${nb} at ${hz(fb.f3Hz)} Hz (6 dB at ${hz(fb.f6Hz)}, 10 dB at ${hz(fb.f10Hz)} Hz)` +
      (Math.abs(fa.f3Hz - fb.f3Hz) / Math.min(fa.f3Hz, fb.f3Hz) > 0.03 ? `, so ${deeper} reaches deeper.` : '.'),
  });
  out.push({
    id: 'bass',
    text:
      `With the same ${significant(a.driveV)} V: at 30 Hz ${na} gives ${one(fa.spl30Db)} dB and ${nb} ${one(fb.spl30Db)} dB; ` +
      `at 40 Hz ${one(fa.spl40Db)} and ${one(fb.spl40Db)} dB; at 50 Hz ${one(fa.spl50Db)} and ${one(fb.spl50Db)} dB at the seat. ` +
      louder(na, nb, fa.spl40Db, fb.spl40Db, 'at 40 Hz'),
  });
  out.push({
    id: 'sensitivity',
    text: `Sensitivity (2.83 V at 1 m): ${na} ${one(fa.sensitivityDb)} dB, ${nb} ${one(fb.sensitivityDb)} dB.`,
  });
  out.push({
    id: 'size',
    text: `Box: ${na} ${boxText(a)}, ${nb} ${boxText(b)}.`,
  });
  if (headroom && headroom[0] && headroom[1]) {
    const [ha, hb] = headroom;
    const d = hb.cleanSplDb - ha.cleanSplDb;
    // The way is named when the design has more than one ("B's tweeter first runs out of ...").
    const first = (name: string, h: HeadroomFinding, an: Analysis) =>
      h.firstLimit && h.firstLimitS !== null
        ? `${name}${h.firstLimitWay && an.system.ways.filter((w) => w.kind === 'driver').length > 1 ? `'s ${h.firstLimitWay}` : ''} first ${LIMIT_PHRASES[h.firstLimit] ?? `reaches ${h.firstLimit}`} at ${clock(h.firstLimitS)}`
        : `${name} reached no limit in the search range`;
    const lead =
      Math.abs(d) < 0.25
        ? `${na} and ${nb} play this track equally loud cleanly (${one(ha.cleanSplDb)} dB at the seat)`
        : `${d > 0 ? nb : na} plays this track ${one(Math.abs(d))} dB louder cleanly than ${d > 0 ? na : nb} ` +
          `(${one(Math.max(ha.cleanSplDb, hb.cleanSplDb))} against ${one(Math.min(ha.cleanSplDb, hb.cleanSplDb))} dB at the seat)`;
    out.push({ id: 'headroom', text: `${lead}; ${first(na, ha, a)}, ${first(nb, hb, b)}.` });
  }
  // Every way with a port speaks for itself; a one-way design is named as before.
  const ported = ([na, nb] as const).flatMap((name, k) => {
    const { ways } = k === 0 ? a : b;
    return ways.map((w) => [ways.length > 1 ? `${name}'s ${w.way.name}` : name, w] as const);
  });
  for (const [name, an] of ported) {
    const speed = an.curves.plannedPortAirSpeed;
    if (!speed) continue;
    let worst = 0;
    let at = 0;
    for (let k = 0; k < speed.length; k++) if (speed[k] > worst) [worst, at] = [speed[k], an.curves.freqHz[k]];
    out.push({
      id: 'port',
      text:
        worst > PORT_SPEED_LIMIT
          ? `${name}'s port reaches ${one(worst)} m/s near ${hz(at)} Hz for a sine at the planned level, over the ${PORT_SPEED_LIMIT} m/s where port noise becomes likely.`
          : `${name}'s port stays at or under ${one(worst)} m/s for a sine at the planned level, below the ${PORT_SPEED_LIMIT} m/s where port noise becomes likely.`,
    });
  }
  out.push({
    id: 'delay',
    text: `Group delay at 40 Hz: ${na} ${one(fa.groupDelay40Ms)} ms, ${nb} ${one(fb.groupDelay40Ms)} ms.`,
  });
  const room = roomSentence(a, b, [na, nb]);
  if (room) out.push({ id: 'room', text: room });
  return out;
}
