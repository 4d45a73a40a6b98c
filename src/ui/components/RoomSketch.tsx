// The listening room seen from above: speakers and seat can be dragged; below it the room's
// Schroeder frequency, its first modes and the bass at the seat with and without the room.
import { useState } from 'preact/hooks';
import type { ListeningDoc } from '../../engine/design/document.ts';
import { useApp } from '../context.ts';
import { clientRoom, withRoom } from '../demo.ts';
import type { Slot } from '../store.ts';

type RoomDoc = NonNullable<ListeningDoc['room']>;
type Point = [number, number, number];
type Handle = 'speaker' | 'speaker0' | 'speaker1' | 'seat';

const SIZE_PX = 200;
const PLOT_W = 200;
const PLOT_H = 70;

/** Speakers as given: one (the pair mirrored about the centre line) or two. */
function speakersOf(room: RoomDoc): { points: Point[]; mirrored: boolean } {
  const s = room.speaker_m;
  if (Array.isArray(s[0])) return { points: s as unknown as Point[], mirrored: false };
  const one = s as unknown as Point;
  return { points: [one, [one[0], room.width_m - one[1], one[2]]], mirrored: true };
}

const round2 = (x: number) => Math.round(x * 100) / 100;

export function RoomSketch(p: { slot: Slot }) {
  const { state, derived, dispatch } = useApp();
  const design = state.designs[p.slot];
  const room = design.listening.room;
  const [drag, setDrag] = useState<{ handle: Handle; at: [number, number] } | null>(null);
  if (!room) {
    return (
      <button
        type="button"
        onClick={() =>
          dispatch({ type: 'replace', slot: p.slot, design: withRoom(design, clientRoom()), reason: 'put the design in the client’s room' })
        }
      >
        Put in the client’s room
      </button>
    );
  }
  // Drawn with the front wall (x = 0) at the top, the left wall (y = 0) on the left.
  const scale = SIZE_PX / Math.max(room.length_m, room.width_m);
  const w = room.width_m * scale;
  const h = room.length_m * scale;
  const { points, mirrored } = speakersOf(room);
  const place = (handle: Handle, pt: Point): [number, number] => (drag?.handle === handle ? drag.at : [pt[1] * scale, pt[0] * scale]);
  const toRoom = (e: PointerEvent): [number, number] => {
    const box = (e.currentTarget as SVGElement).getBoundingClientRect();
    const clamp = (v: number, max: number) => Math.min(Math.max(v, 0.1 * scale), max - 0.1 * scale);
    return [clamp(e.clientX - box.left, w), clamp(e.clientY - box.top, h)];
  };
  const commit = (handle: Handle, [px, py]: [number, number]) => {
    const y = round2(px / scale);
    const x = round2(py / scale);
    if (handle === 'seat') {
      dispatch({ type: 'edit', slot: p.slot, path: 'listening.room.seat_m', value: [x, y, room.seat_m[2]] });
    } else if (handle === 'speaker') {
      dispatch({ type: 'edit', slot: p.slot, path: 'listening.room.speaker_m', value: [x, y, points[0][2]] });
    } else {
      const k = handle === 'speaker0' ? 0 : 1;
      const next = points.map((q, i) => (i === k ? [x, y, q[2]] : q));
      dispatch({ type: 'edit', slot: p.slot, path: 'listening.room.speaker_m', value: next });
    }
  };
  // A mirrored right speaker follows the left one: only the left one is dragged.
  const speakerHandle = (k: number): Handle | null => (mirrored ? (k === 0 ? 'speaker' : null) : k === 0 ? 'speaker0' : 'speaker1');
  const handles: { handle: Handle | null; pt: Point; label: string; seat: boolean }[] = [
    ...points.map((pt, k) => ({
      handle: speakerHandle(k),
      pt,
      label: k === 0 ? 'Left speaker' : mirrored ? 'Right speaker (mirrors the left one)' : 'Right speaker',
      seat: false,
    })),
    { handle: 'seat' as const, pt: room.seat_m as Point, label: 'Seat', seat: true },
  ];
  const analysis = derived[p.slot].analysis;
  const r = analysis?.room;
  return (
    <div class="room-sketch">
      <svg
        width={w}
        height={h}
        viewBox={`0 0 ${w} ${h}`}
        role="img"
        aria-label={`Room ${room.length_m} by ${room.width_m} m seen from above, front wall at the top`}
        onPointerMove={(e) => drag && setDrag({ handle: drag.handle, at: toRoom(e) })}
        onPointerUp={(e) => {
          if (!drag) return;
          commit(drag.handle, toRoom(e));
          setDrag(null);
        }}
        onPointerLeave={() => setDrag(null)}
      >
        <rect x={0} y={0} width={w} height={h} fill="none" stroke="currentColor" stroke-width={2} />
        {handles.map(({ handle, pt, label, seat }) => {
          const movable = handle !== null;
          const [cx, cy] = handle ? place(handle, pt) : [pt[1] * scale, pt[0] * scale];
          const start = (e: PointerEvent) => {
            if (!handle) return;
            (e.currentTarget as SVGGraphicsElement).ownerSVGElement?.setPointerCapture?.(e.pointerId);
            setDrag({ handle, at: [cx, cy] });
          };
          return seat ? (
            <circle cx={cx} cy={cy} r={7} fill="currentColor" onPointerDown={start} style={{ cursor: 'move' }}>
              <title>{label}</title>
            </circle>
          ) : (
            <rect
              x={cx - 6}
              y={cy - 6}
              width={12}
              height={12}
              fill={movable ? 'currentColor' : 'none'}
              stroke="currentColor"
              onPointerDown={start}
              style={{ cursor: movable ? 'move' : 'default' }}
            >
              <title>{label}</title>
            </rect>
          );
        })}
      </svg>
      {r ? (
        <>
          <p class="room-figures">
            Schroeder frequency {r.schroederHz.toFixed(0)} Hz (reverberation {r.t60S.toFixed(2)} s). First modes:{' '}
            {r.modes
              .slice(0, 5)
              .map((m) => `${m.hz.toFixed(1)} Hz (${m.nx},${m.ny},${m.nz})`)
              .join(', ')}
            .
          </p>
          <RoomCurve freqHz={r.curves.freqHz} inRoom={r.curves.splDb} free={r.curves.freeSplDb} />
        </>
      ) : null}
      <button
        type="button"
        class="ghost"
        onClick={() =>
          dispatch({ type: 'replace', slot: p.slot, design: withRoom(design, undefined), reason: 'take the design out of the room' })
        }
      >
        Without a room
      </button>
    </div>
  );
}

/** The sum at the seat from 20 to 200 Hz: with the room (solid) and without (dashed). */
function RoomCurve(p: { freqHz: Float64Array; inRoom: Float64Array; free: Float64Array }) {
  const idx: number[] = [];
  p.freqHz.forEach((f, k) => {
    if (f >= 20 && f <= 200) idx.push(k);
  });
  if (idx.length < 2) return null;
  const all = idx.flatMap((k) => [p.inRoom[k], p.free[k]]);
  const top = Math.max(...all);
  const bottom = Math.max(Math.min(...all), top - 50);
  const x = (f: number) => (Math.log10(f / 20) / Math.log10(10)) * PLOT_W;
  const y = (db: number) => ((top - Math.max(db, bottom)) / (top - bottom)) * PLOT_H;
  const line = (v: Float64Array) => idx.map((k) => `${x(p.freqHz[k]).toFixed(1)},${y(v[k]).toFixed(1)}`).join(' ');
  return (
    <svg
      width={PLOT_W}
      height={PLOT_H}
      viewBox={`0 0 ${PLOT_W} ${PLOT_H}`}
      role="img"
      aria-label="Bass at the seat from 20 to 200 Hz, in the room (solid) and without it (dashed)"
    >
      <polyline points={line(p.free)} fill="none" stroke="currentColor" stroke-dasharray="4 3" stroke-width={1} />
      <polyline points={line(p.inRoom)} fill="none" stroke="currentColor" stroke-width={1.5} />
    </svg>
  );
}

/** Both designs of the pair in the client's room, or both out of it. */
export function RoomPairSwitch() {
  const { state, dispatch } = useApp();
  const { a, b } = state.designs;
  const inside = a.listening.room !== undefined && b.listening.room !== undefined;
  const room = inside ? undefined : clientRoom();
  return (
    <button
      type="button"
      onClick={() =>
        dispatch({
          type: 'replace-pair',
          designs: { a: withRoom(a, room), b: withRoom(b, room) },
          reason: inside ? 'take A and B out of the room' : 'put A and B in the client’s room',
        })
      }
    >
      {inside ? 'Both without a room' : 'Both in the client’s room'}
    </button>
  );
}
