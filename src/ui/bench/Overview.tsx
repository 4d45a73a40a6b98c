// The waveform overview (and, on the Stress strip, one lane of stress events per way of each design
// and one density lane per design: the share of each second in each kind of event) on a canvas.
// Click to jump there, drag to set a loop region, hover an event for its cause, peak and limit.
// The static picture is drawn once per change into an offscreen canvas; only the playhead moves per frame.
import { useCallback, useEffect, useLayoutEffect, useRef, useState } from 'preact/hooks';
import type { BenchAudio, BenchState } from '../../audio/bench.ts';
import type { EventKind, StressEvent } from '../../engine/render/index.ts';
import type { DesignSlot } from '../../audio/protocol.ts';
import { clock, colourOf, describeEvent, KIND_LABEL } from './palette.ts';
import { useAnimationFrame } from './useBench.ts';
import type { EventLane } from './event-lanes.ts';
import { sharesAt, type DensityLane } from './event-density.ts';

/** Drawing order: the most serious kinds last, so they sit on top. */
const ORDER: EventKind[] = [
  'distortion',
  'compression',
  'coil-temperature',
  'port-speed',
  'radiator-excursion',
  'excursion',
  'amplifier-clip',
  'xlim',
];
const GUTTER = 74;
const AXIS_H = 20;
const LANE_H = 30;
const LANE_GAP = 6;
const DENSITY_H = 56;

interface Props {
  bench: BenchAudio;
  state: BenchState;
  theme: string;
  height: number;
  /** Event lanes, one per way of each design (the Stress strip); none on the bench. */
  events?: EventLane[] | null;
  /** Density lanes, one per design, under the event lanes (the Stress strip). */
  density?: DensityLane[] | null;
  names?: Record<DesignSlot, string>;
}

interface Tip {
  x: number;
  y: number;
  lane: { slot: DesignSlot; way: string };
  items: StressEvent[];
  /** On a density lane: the bin's span and the kinds' shares in it. */
  shares?: { fromS: number; toS: number; list: { kind: EventKind; share: number }[] };
}

function css(el: Element, name: string, fallback: string): string {
  return getComputedStyle(el).getPropertyValue(name).trim() || fallback;
}

function niceStep(seconds: number, px: number): number {
  const want = (seconds / px) * 90;
  for (const s of [0.1, 0.25, 0.5, 1, 2, 5, 10, 15, 30, 60, 120, 300, 600]) if (s >= want) return s;
  return 1200;
}

export function Overview(p: Props) {
  const wrap = useRef<HTMLDivElement>(null);
  const canvas = useRef<HTMLCanvasElement>(null);
  const layer = useRef<HTMLCanvasElement | null>(null);
  const [width, setWidth] = useState(800);
  const [tip, setTip] = useState<Tip | null>(null);
  const drag = useRef<{ x0: number; x1: number; moved: boolean } | null>(null);
  const [dragView, setDragView] = useState<{ a: number; b: number } | null>(null);
  const track = p.state.track;
  const lanes: EventLane[] = p.events ?? [];
  /** Way names are written only where a design has more than one lane. */
  const manyWays = (slot: DesignSlot) => lanes.filter((l) => l.slot === slot).length > 1;
  const dens: DensityLane[] = p.density ?? [];
  const waveH = p.height;
  const densityTop = waveH + lanes.length * (LANE_H + LANE_GAP);
  const densityY = (j: number) => densityTop + LANE_GAP + j * (DENSITY_H + LANE_GAP);
  const total = densityTop + dens.length * (DENSITY_H + LANE_GAP) + AXIS_H;
  const plotW = Math.max(50, width - GUTTER - 8);
  const duration = track ? track.frames / track.sampleRate : 1;
  const xOf = (t: number) => GUTTER + (t / duration) * plotW;
  const tOf = (x: number) => Math.max(0, Math.min(duration, ((x - GUTTER) / plotW) * duration));

  useLayoutEffect(() => {
    const el = wrap.current;
    if (!el) return;
    const ro = new ResizeObserver(() => setWidth(Math.max(300, Math.floor(el.clientWidth))));
    ro.observe(el);
    setWidth(Math.max(300, Math.floor(el.clientWidth)));
    return () => ro.disconnect();
  }, []);

  // The static layer: waveform, loop, event lanes, axis.
  useEffect(() => {
    const el = canvas.current;
    if (!el) return;
    const dpr = window.devicePixelRatio || 1;
    const off = layer.current ?? document.createElement('canvas');
    layer.current = off;
    off.width = Math.round(width * dpr);
    off.height = Math.round(total * dpr);
    el.width = off.width;
    el.height = off.height;
    const g = off.getContext('2d');
    if (!g) return;
    g.setTransform(dpr, 0, 0, dpr, 0, 0);
    const surface = css(el, '--c-surface', '#fff');
    const grid = css(el, '--c-grid', '#e6eaeb');
    const axis = css(el, '--c-axis', '#4a5357');
    const muted = css(el, '--c-muted', '#5a6468');
    const wave = css(el, '--c-ref', '#8a9296');
    const focus = css(el, '--c-focus', '#1f6feb');
    g.fillStyle = surface;
    g.fillRect(0, 0, width, total);
    g.font = '12px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
    g.textBaseline = 'middle';
    // Waveform.
    g.fillStyle = muted;
    g.fillText('Track', 8, waveH / 2);
    g.strokeStyle = grid;
    g.beginPath();
    g.moveTo(GUTTER, waveH / 2 + 0.5);
    g.lineTo(GUTTER + plotW, waveH / 2 + 0.5);
    g.stroke();
    if (track) {
      const { min, max } = track.overview;
      const nb = min.length;
      g.fillStyle = wave;
      const mid = waveH / 2,
        amp = waveH / 2 - 4;
      for (let px = 0; px < plotW; px++) {
        const b0 = Math.floor((px / plotW) * nb),
          b1 = Math.max(b0 + 1, Math.floor(((px + 1) / plotW) * nb));
        let lo = 0,
          hi = 0;
        for (let b = b0; b < b1 && b < nb; b++) {
          if (min[b] < lo) lo = min[b];
          if (max[b] > hi) hi = max[b];
        }
        const y0 = mid - hi * amp,
          y1 = mid - lo * amp;
        g.fillRect(GUTTER + px, y0, 1, Math.max(1, y1 - y0));
      }
    }
    // Event lanes.
    lanes.forEach((lane, i) => {
      const slot = lane.slot;
      const y = waveH + LANE_GAP + i * (LANE_H + LANE_GAP);
      g.fillStyle = css(el, '--c-surface-2', '#f8faf9');
      g.fillRect(GUTTER, y, plotW, LANE_H);
      g.strokeStyle = grid;
      g.strokeRect(GUTTER + 0.5, y + 0.5, plotW - 1, LANE_H - 1);
      g.fillStyle = css(el, slot === 'a' ? '--c-a' : '--c-b', slot === 'a' ? '#0b6b70' : '#c27c08');
      g.fillRect(8, y + 7, 16, 16);
      g.fillStyle = slot === 'a' ? '#fff' : '#1b1300';
      g.font = 'bold 11px system-ui, sans-serif';
      g.textAlign = 'center';
      g.fillText(slot.toUpperCase(), 16, y + 15.5);
      g.textAlign = 'left';
      g.fillStyle = muted;
      const list = lane.events;
      if (manyWays(slot)) {
        g.font = '10px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
        g.fillText(lane.way.length > 8 ? `${lane.way.slice(0, 7)}…` : lane.way, 28, y + 9);
        g.fillText(list.length ? `${list.length}` : 'none', 28, y + 22);
        g.font = '12px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
      } else {
        g.font = '12px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
        g.fillText(list.length ? `${list.length}` : 'none', 30, y + 15.5);
      }
      for (const kind of ORDER) {
        g.fillStyle = colourOf(kind, p.theme);
        for (const e of list) {
          if (e.kind !== kind) continue;
          const x0 = xOf(e.start_s),
            x1 = Math.max(x0 + 2, xOf(e.end_s));
          g.fillRect(x0, y + 4, x1 - x0, LANE_H - 8);
        }
      }
    });
    // Density lanes: one thin row per kind present (the most serious on top), each bin's bar as tall
    // as its share of that second; kinds often overlap in time, so they are not stacked on each other.
    dens.forEach((lane, j) => {
      const y = densityY(j);
      g.fillStyle = css(el, '--c-surface-2', '#f8faf9');
      g.fillRect(GUTTER, y, plotW, DENSITY_H);
      g.strokeStyle = grid;
      g.strokeRect(GUTTER + 0.5, y + 0.5, plotW - 1, DENSITY_H - 1);
      g.fillStyle = css(el, lane.slot === 'a' ? '--c-a' : '--c-b', lane.slot === 'a' ? '#0b6b70' : '#c27c08');
      g.fillRect(8, y + 4, 16, 16);
      g.fillStyle = lane.slot === 'a' ? '#fff' : '#1b1300';
      g.font = 'bold 11px system-ui, sans-serif';
      g.textAlign = 'center';
      g.fillText(lane.slot.toUpperCase(), 16, y + 12.5);
      g.textAlign = 'left';
      g.fillStyle = muted;
      g.font = '10px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
      g.fillText('share', 28, y + 10);
      g.fillText(lane.binS === 1 ? 'per s' : `per ${lane.binS} s`, 28, y + 22);
      g.font = '12px system-ui, -apple-system, "Segoe UI", Roboto, sans-serif';
      const kinds = [...ORDER].reverse().filter((k) => lane.share.has(k));
      const rowH = (DENSITY_H - 4) / Math.max(1, kinds.length);
      const gap = plotW / lane.bins > 4 ? 1 : 0;
      kinds.forEach((k, r) => {
        const base = y + 2 + (r + 1) * rowH;
        const share = lane.share.get(k)!;
        g.fillStyle = colourOf(k, p.theme);
        for (let i = 0; i < lane.bins; i++) {
          if (share[i] <= 0) continue;
          const x0 = xOf(i * lane.binS);
          const x1 = Math.max(x0 + 1, xOf(Math.min(duration, (i + 1) * lane.binS)) - gap);
          const bh = Math.max(1, share[i] * (rowH - 1));
          g.fillRect(x0, base - bh, x1 - x0, bh);
        }
      });
    });
    // Loop region.
    const loop = p.state.loop;
    if (track && loop) {
      const x0 = xOf(loop.startFrame / track.sampleRate),
        x1 = xOf(loop.endFrame / track.sampleRate);
      const h = total - AXIS_H;
      g.fillStyle = focus;
      g.globalAlpha = 0.1;
      g.fillRect(x0, 0, x1 - x0, h);
      g.globalAlpha = 1;
      g.strokeStyle = focus;
      g.lineWidth = 1.5;
      g.beginPath();
      g.moveTo(x0, 0);
      g.lineTo(x0, h);
      g.moveTo(x1, 0);
      g.lineTo(x1, h);
      g.stroke();
      g.lineWidth = 1;
    }
    // Time axis.
    const ay = total - AXIS_H;
    g.strokeStyle = axis;
    g.beginPath();
    g.moveTo(GUTTER, ay + 0.5);
    g.lineTo(GUTTER + plotW, ay + 0.5);
    g.stroke();
    g.fillStyle = muted;
    g.textAlign = 'center';
    const step = niceStep(duration, plotW);
    for (let t = 0; t <= duration + 1e-9; t += step) {
      const x = Math.round(xOf(t)) + 0.5;
      g.beginPath();
      g.moveTo(x, ay);
      g.lineTo(x, ay + 4);
      g.stroke();
      g.fillText(clock(t, step < 1 ? 1 : 0), x, ay + 12);
    }
    g.textAlign = 'left';
    drawFrame();
  }, [width, total, track, p.events, p.density, p.state.loop, p.theme, lanes.length]);

  const drawFrame = useCallback(() => {
    const el = canvas.current,
      off = layer.current;
    if (!el || !off) return;
    const g = el.getContext('2d');
    if (!g) return;
    const dpr = window.devicePixelRatio || 1;
    g.setTransform(1, 0, 0, 1, 0, 0);
    g.drawImage(off, 0, 0);
    g.setTransform(dpr, 0, 0, dpr, 0, 0);
    const d = drag.current;
    if (d && d.moved) {
      g.fillStyle = css(el, '--c-focus', '#1f6feb');
      g.globalAlpha = 0.16;
      g.fillRect(Math.min(d.x0, d.x1), 0, Math.abs(d.x1 - d.x0), total - AXIS_H);
      g.globalAlpha = 1;
    }
    const t = track ? p.bench.positionNow() / track.sampleRate : 0;
    const x = Math.round(xOf(t)) + 0.5;
    g.strokeStyle = css(el, '--c-text', '#1b2225');
    g.lineWidth = 1.5;
    g.beginPath();
    g.moveTo(x, 0);
    g.lineTo(x, total - AXIS_H);
    g.stroke();
    g.lineWidth = 1;
  }, [track, width, total, p.bench]);

  useAnimationFrame(p.state.playing || dragView !== null, drawFrame);
  useEffect(drawFrame, [p.state.position, drawFrame]);

  const local = (e: MouseEvent) => {
    const r = canvas.current!.getBoundingClientRect();
    return { x: e.clientX - r.left, y: e.clientY - r.top };
  };
  const laneAt = (y: number): EventLane | null => {
    for (let i = 0; i < lanes.length; i++) {
      const y0 = waveH + LANE_GAP + i * (LANE_H + LANE_GAP);
      if (y >= y0 && y < y0 + LANE_H) return lanes[i];
    }
    return null;
  };
  const densityAt = (y: number): DensityLane | null => {
    for (let j = 0; j < dens.length; j++) if (y >= densityY(j) && y < densityY(j) + DENSITY_H) return dens[j];
    return null;
  };
  const eventsAt = (lane: EventLane, x: number) => {
    const list = lane.events;
    const t = tOf(x),
      pad = (3 / plotW) * duration;
    return list.filter((e) => e.start_s - pad <= t && t <= e.end_s + pad).sort((a, b) => ORDER.indexOf(b.kind) - ORDER.indexOf(a.kind));
  };

  const onDown = (e: MouseEvent) => {
    if (!track || e.button !== 0) return;
    const { x } = local(e);
    if (x < GUTTER) return;
    drag.current = { x0: x, x1: x, moved: false };
    setDragView({ a: x, b: x });
    const move = (ev: MouseEvent) => {
      const d = drag.current;
      if (!d) return;
      d.x1 = Math.max(GUTTER, Math.min(GUTTER + plotW, local(ev).x));
      if (Math.abs(d.x1 - d.x0) > 4) d.moved = true;
    };
    const up = (ev: MouseEvent) => {
      window.removeEventListener('mousemove', move);
      window.removeEventListener('mouseup', up);
      const d = drag.current;
      drag.current = null;
      setDragView(null);
      if (!d) return;
      if (d.moved) p.bench.setLoop({ startS: tOf(d.x0), endS: tOf(d.x1) });
      else {
        const pos = local(ev);
        const lane = laneAt(pos.y);
        const hit = lane ? eventsAt(lane, pos.x) : [];
        p.bench.seek(hit.length ? Math.max(0, hit[0].start_s - 0.25) : tOf(pos.x));
      }
    };
    window.addEventListener('mousemove', move);
    window.addEventListener('mouseup', up);
  };
  const onMove = (e: MouseEvent) => {
    if (!p.events || drag.current) return;
    const { x, y } = local(e);
    const d = x >= GUTTER ? densityAt(y) : null;
    if (d) {
      const bin = Math.min(d.bins - 1, Math.floor(tOf(x) / d.binS));
      const list = sharesAt(d, bin);
      const span = { fromS: bin * d.binS, toS: Math.min(duration, (bin + 1) * d.binS), list };
      setTip(list.length ? { x, y, lane: { slot: d.slot, way: '' }, items: [], shares: span } : null);
      return;
    }
    const lane = laneAt(y);
    const items = lane && x >= GUTTER ? eventsAt(lane, x) : [];
    setTip(lane && items.length ? { x, y, lane, items: items.slice(0, 4) } : null);
  };
  const onKey = (e: KeyboardEvent) => {
    if (!track) return;
    const now = p.bench.positionNow() / track.sampleRate;
    const step = e.shiftKey ? 5 : 1;
    if (e.key === 'ArrowRight') p.bench.seek(now + step);
    else if (e.key === 'ArrowLeft') p.bench.seek(now - step);
    else if (e.key === 'Home') p.bench.seek(0);
    else return;
    e.preventDefault();
  };

  const label = track
    ? `${p.events ? 'Stress strip' : 'Waveform overview'} of ${track.name}, ${clock(duration)} long. Click to jump, drag to set a loop, arrow keys to move by a second.`
    : 'No track loaded';
  return (
    <div class="overview" ref={wrap} style={{ height: `${total}px` }}>
      <canvas
        ref={canvas}
        style={{ width: `${width}px`, height: `${total}px` }}
        tabIndex={0}
        role="slider"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={Math.round(duration)}
        aria-valuenow={track ? Math.round(p.state.position / track.sampleRate) : 0}
        aria-valuetext={track ? clock(p.state.position / track.sampleRate) : '0:00'}
        data-testid={p.events ? 'stress-canvas' : 'overview-canvas'}
        data-gutter={GUTTER}
        data-plot-width={plotW}
        onMouseDown={onDown}
        onMouseMove={onMove}
        onMouseLeave={() => setTip(null)}
        onKeyDown={onKey}
      />
      {tip ? (
        <div
          class="strip-tip"
          role="tooltip"
          style={{ left: `${Math.min(tip.x + 12, width - 330)}px`, top: `${tip.y + 14}px` }}
          data-testid="strip-tip"
        >
          <strong>
            Design {tip.lane.slot.toUpperCase()}
            {p.names ? ` · ${p.names[tip.lane.slot]}` : ''}
            {tip.lane.way ? ` · ${tip.lane.way}` : ''}
          </strong>
          {tip.shares ? (
            <span class="tip-row">
              <span>
                {clock(tip.shares.fromS, 0)}–{clock(tip.shares.toS, 0)}:{' '}
                {tip.shares.list.map((x) => `${KIND_LABEL[x.kind]} ${x.share < 0.01 ? '<1' : Math.round(100 * x.share)} %`).join(', ')} of
                the time
              </span>
            </span>
          ) : null}
          {tip.items.map((ev) => (
            <span class="tip-row">
              <i style={{ background: colourOf(ev.kind, p.theme) }} />
              <span>
                <b>{KIND_LABEL[ev.kind]}</b>
                <br />
                {describeEvent(ev).split(': ')[1]}, {clock(ev.start_s, 2)}–{clock(ev.end_s, 2)}
              </span>
            </span>
          ))}
        </div>
      ) : null}
    </div>
  );
}
