// A render that runs a share of the ways' lanes on a second thread (the CLI's worker,
// engine/render/lane-share.ts), or a calibration that runs its upper channels there, gives bit for
// bit what one thread gives: every stream, trace, event and figure, for every example design, a
// mono-sum pair on three channels, a mono track, a render stopped at its first event, side streams
// and the driver models below the audio rate. A helper that fails is reported, not waited on.
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../src/engine/design/validate.ts';
import { synthesizeDemoTrack } from '../src/engine/demo/track.ts';
import {
  createRenderer,
  findHeadroom,
  renderBuffer,
  startRender,
  type LaneJob,
  type RenderBufferOptions,
} from '../src/engine/render/index.ts';
import { seatLeqCPerVolt } from '../src/engine/level/calibration.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';
import { laneThread } from '../src/cli/lane-helper.ts';
import { sealedBox, system } from './sim-fixtures.ts';

const fs = 48000;
const track = synthesizeDemoTrack(fs);
const excerpt = (seconds: number, channels = 2) =>
  Array.from({ length: channels }, (_, c) => track.channels[c % 2].slice(10 * fs, (10 + seconds) * fs));
const stereo = excerpt(3);

const examples = join(import.meta.dirname, '..', 'public', 'examples');
const load = (file: string): SpeakerSystem => {
  const parsed = parseDesign(JSON.parse(readFileSync(join(examples, file), 'utf8')));
  if (!parsed.ok) throw new Error(`${file} does not parse`);
  return parsed.system;
};

const helper = laneThread();
const sha = (arrays: Float32Array[] | null) => {
  const h = createHash('sha256');
  for (const a of arrays ?? []) h.update(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
  return h.digest('hex');
};
/** Everything a render returns but its clock. */
const fingerprint = (r: ReturnType<typeof renderBuffer>) => {
  const { realtime_factor: _rt, ...summary } = r.summary;
  const t = r.traces;
  return {
    audio: sha(r.audio),
    linear: sha(r.linear),
    residual: sha(r.residual),
    traces: JSON.stringify(t),
    summary,
  };
};
const both = (sys: SpeakerSystem, channels: Float32Array[], opt: RenderBufferOptions) => {
  const one = fingerprint(renderBuffer(sys, channels, fs, opt));
  const two = fingerprint(renderBuffer(sys, channels, fs, { ...opt, helper }));
  return { one, two };
};

describe('two threads render bit for bit as one', () => {
  for (const file of readdirSync(examples).filter((f) => f.endsWith('.json'))) {
    it(`${file}: loud enough for events, with side streams`, () => {
      const sys = load(file);
      const { one, two } = both(sys, stereo, { splDb: 108, extraStreams: true });
      expect(one.summary.events.length).toBeGreaterThan(0);
      expect(two).toEqual(one);
    });
  }

  it('the calibration pass: the same Leq,C per volt to the last bit, on two and three channels', () => {
    for (const file of ['living-room-vented-in-room.json', 'bookshelf-two-way-passive.json']) {
      const sys = load(file);
      expect(seatLeqCPerVolt(sys, stereo, fs, helper)).toBe(seatLeqCPerVolt(sys, stereo, fs));
      const three = excerpt(2, 3);
      expect(seatLeqCPerVolt(sys, three, fs, helper)).toBe(seatLeqCPerVolt(sys, three, fs));
    }
  });

  it('a mono-sum pair on three channels (its shared bass lane reads them all) and a mono track', () => {
    const sys = system(sealedBox(), { channels: 'mono-sum', xo: 'lr4', fx: 150 });
    const three = excerpt(2, 3);
    const { one, two } = both(sys, three, { splDb: 100 });
    expect(two).toEqual(one);
    expect(seatLeqCPerVolt(sys, three, fs, helper)).toBe(seatLeqCPerVolt(sys, three, fs));
    const mono = both(load('living-room-vented.json'), excerpt(2, 1), { splDb: 100 });
    expect(mono.two).toEqual(mono.one);
  });

  it('shares the work by lane cost: the cone models to the helper, their twins, the light lanes and the joining here', () => {
    const plan = (file: string, channels: number) =>
      createRenderer(load(file), { sampleRate: fs, channels, voltsFs: 10 }).helperPlan().lanes;
    // Woofer and flat upper band, stereo: both woofer lanes are the helper's, the flat band stays.
    expect(plan('living-room-vented.json', 2)).toEqual([
      [true, true],
      [false, false],
    ]);
    // Mono: the woofer there, the flat band and everything else here.
    expect(plan('living-room-vented.json', 1)).toEqual([[true], [false]]);
    // Two passive ways in stereo: three of the four driver lanes to the helper, their linear twins
    // and the fourth lane here (1.5 a lane, 0.2 of it the twin; 1.14 for joining two channels).
    expect(plan('bookshelf-two-way-passive.json', 2).flat().filter(Boolean)).toHaveLength(3);
  });

  it('a render stopped at its first event, odd block sizes, and the driver models below the audio rate', () => {
    const sys = load('garage-subwoofer-bandpass.json');
    const stop = both(sys, stereo, { splDb: 110, analysisOnly: true, stopAtFirstEvent: true });
    expect(stop.one.summary.events.length).toBeGreaterThan(0);
    expect(stop.two).toEqual(stop.one);
    const odd = both(load('living-room-vented.json'), stereo, { splDb: 100, blockFrames: 1000 });
    expect(odd.two).toEqual(odd.one);
    const low = both(sys, stereo, { splDb: 100, driverRate: 'reduced' });
    expect(low.two).toEqual(low.one);
  });

  it('a render taken a few blocks at a time (startRender, as the CLI drives it), on one or two threads, and stopped at its first event', () => {
    const stepped = (sys: SpeakerSystem, opt: RenderBufferOptions, blocks: number) => {
      const run = startRender(sys, stereo, fs, opt);
      let steps = 0;
      while (run.step(blocks)) steps++;
      return { r: fingerprint(run.finish()), steps };
    };
    const vented = load('living-room-vented.json');
    const whole = fingerprint(renderBuffer(vented, stereo, fs, { splDb: 100, blockFrames: 1000, extraStreams: true }));
    for (const threads of [undefined, helper]) {
      const { r, steps } = stepped(vented, { splDb: 100, blockFrames: 1000, extraStreams: true, helper: threads }, 3);
      expect(steps).toBeGreaterThan(40);
      expect(r).toEqual(whole);
    }
    const sub = load('garage-subwoofer-bandpass.json');
    const stopOpt = { splDb: 110, analysisOnly: true, stopAtFirstEvent: true };
    expect(stepped(sub, { ...stopOpt, helper }, 1).r).toEqual(fingerprint(renderBuffer(sub, stereo, fs, stopOpt)));
  });

  it('a headroom search finds the same level with a helper', () => {
    const sys = load('living-room-sealed.json');
    const a = findHeadroom(sys, stereo, fs);
    const b = findHeadroom(sys, stereo, fs, { helper });
    expect(b).toEqual(a);
  });

  it('a helper that fails, or ends early, makes the render throw with its reason instead of waiting', () => {
    const sys = load('living-room-vented.json');
    const failing = (job: LaneJob) => helper({ ...job, system: null } as unknown as LaneJob);
    expect(() => renderBuffer(sys, stereo, fs, { splDb: 90, helper: failing })).toThrow(/second render thread failed: .*null/);
    const short = (job: LaneJob) => helper({ ...job, frames: 1000, total: 1000 } as LaneJob);
    expect(() => renderBuffer(sys, stereo, fs, { splDb: 90, helper: short })).toThrow(/ended before the input did/);
  });
});
