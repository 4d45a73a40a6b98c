// The room's effect on a pair of designs in one plain sentence, from computed numbers only.
import type { Analysis } from '../response/types.ts';
import { ROOM_BAND_HZ, type RoomAnalysis } from './analysis.ts';
import { fmt } from '../issues.ts';

const one = (x: number) => x.toFixed(1);
const whole = (x: number) => x.toFixed(0);

/** Peak-to-dip of the in-room curve over the room's band, dB. */
export function roomSpanDb(r: RoomAnalysis): number {
  let lo = Infinity;
  let hi = -Infinity;
  r.curves.freqHz.forEach((f, k) => {
    if (f < ROOM_BAND_HZ[0] || f > ROOM_BAND_HZ[1]) return;
    lo = Math.min(lo, r.curves.splDb[k]);
    hi = Math.max(hi, r.curves.splDb[k]);
  });
  return hi - lo;
}

/** One sentence on what the room does at the seat, or null when neither design has a room. */
export function roomSentence(a: Analysis, b: Analysis, [na, nb]: [string, string]): string | null {
  const ra = a.room;
  const rb = b.room;
  const r = ra ?? rb;
  if (!r) return null;
  const room = (ra ? a : b).system.listening.room!;
  const [lx, ly, lz] = room.size;
  const first = r.modes
    .slice(0, 3)
    .map((m) => whole(m.hz))
    .join(', ');
  const band = `${ROOM_BAND_HZ[0]} to ${ROOM_BAND_HZ[1]} Hz`;
  const spans =
    ra && rb
      ? `${na}'s bass at the seat swings ${one(roomSpanDb(ra))} dB from peak to dip over ${band} and ${nb}'s ${one(roomSpanDb(rb))} dB`
      : `${ra ? na : nb}'s bass at the seat swings ${one(roomSpanDb(r))} dB from peak to dip over ${band} (${ra ? nb : na} is heard without a room)`;
  return (
    `In the ${fmt(lx)} × ${fmt(ly)} × ${fmt(lz)} m room (reverberation ${r.t60S.toFixed(2)} s, first modes at ${first} Hz, modes rule below ${whole(r.schroederHz)} Hz), ` +
    `${spans}: the room adds up to ${one(r.peakDb)} dB near ${whole(r.peakHz)} Hz and takes up to ${one(-r.dipDb)} dB near ${whole(r.dipHz)} Hz.`
  );
}
