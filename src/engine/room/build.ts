// The room of a design document in SI, with every impossible placement reported by its field.
import type { ListeningDoc } from '../design/document.ts';
import type { Room, RoomSurface, Vec3 } from '../system.ts';
import { error, fmt, type Issue } from '../issues.ts';

const SURFACES: RoomSurface[] = ['floor', 'ceiling', 'front', 'back', 'left', 'right'];
const AXES = ['length', 'width', 'height'] as const;
/** Closer than this to a wall or to each other, a point source and a seat are no longer a model of a loudspeaker and a head. */
const MIN_CLEARANCE_M = 0.05;
const MIN_SPEAKER_SEAT_M = 0.3;

function inside(p: Vec3, size: Vec3, path: string, what: string, issues: Issue[]): void {
  p.forEach((value, i) => {
    if (value < MIN_CLEARANCE_M || value > size[i] - MIN_CLEARANCE_M)
      issues.push(
        error(
          `${path}[${i}]`,
          `the ${what} at ${fmt(value)} m lies outside the room's ${AXES[i]} of ${fmt(size[i])} m (keep it at least ${MIN_CLEARANCE_M * 100} cm from the walls)`,
        ),
      );
  });
}

const distance = (a: Vec3, b: Vec3): number => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

/** The room in SI, or undefined when the document has none; problems go to `issues`. */
export function toRoom(listening: ListeningDoc, issues: Issue[]): Room | undefined {
  const doc = listening.room;
  if (!doc) return undefined;
  const path = 'listening.room';
  if ((listening.room_gain_hz ?? 0) > 0)
    issues.push(
      error(
        'listening.room_gain_hz',
        'a room gain corner and a room cannot both be given: the room already makes its own bass gain from its modes; keep room_gain_hz for a car cabin or an unknown room',
      ),
    );
  const size: Vec3 = [doc.length_m, doc.width_m, doc.height_m];
  const given = doc.speaker_m;
  const pair = Array.isArray(given[0]);
  // One position stands for the left speaker; the right one mirrors it about the room's centre line.
  const speakers: Vec3[] = pair
    ? (given as [Vec3, Vec3]).map((p) => [...p] as Vec3)
    : [[...(given as Vec3)] as Vec3, [given[0] as number, size[1] - (given[1] as number), given[2] as number]];
  // A mirrored speaker lies inside whenever the given one does: check only what was given.
  for (let k = 0; k < (pair ? 2 : 1); k++)
    inside(speakers[k], size, pair ? `${path}.speaker_m[${k}]` : `${path}.speaker_m`, 'speaker', issues);
  const seat: Vec3 = [...doc.seat_m];
  inside(seat, size, `${path}.seat_m`, 'seat', issues);
  speakers.forEach((p, k) => {
    if (distance(p, seat) < MIN_SPEAKER_SEAT_M)
      issues.push(
        error(
          `${path}.seat_m`,
          `the seat is ${fmt(distance(p, seat))} m from speaker ${k + 1}; it must be at least ${MIN_SPEAKER_SEAT_M} m away`,
        ),
      );
  });
  const a = doc.absorption;
  const absorption = Object.fromEntries(SURFACES.map((s) => [s, typeof a === 'number' ? a : a[s]])) as Record<RoomSurface, number>;
  return { size, speakers, seat, absorption };
}
