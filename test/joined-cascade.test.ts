// The calibration runs each way's chain and the C weighting as one joined cascade (filters/biquad.ts
// JoinedCascade). Its numbers must be those of the stages run one after the other: checked here on
// random sections, gains and block splits, and on the level of every example design against the
// stages computed apart in this file (the energies added in the calibration's order: channel by
// channel, way by way, block by block).
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BiquadCascade, JoinedCascade } from '../src/engine/filters/biquad.ts';
import { parseDesign } from '../src/engine/design/validate.ts';
import { synthesizeDemoTrack } from '../src/engine/demo/track.ts';
import { seatLeqCPerVolt } from '../src/engine/level/calibration.ts';
import { cWeightingFilter } from '../src/engine/level/weighting.ts';
import { designLinearChain } from '../src/engine/render/linear-chain.ts';
import { splDbOfMeanSquare } from '../src/engine/units.ts';
import type { SpeakerSystem } from '../src/engine/system.ts';

/** A stable random section: poles inside the unit circle, any zeros. */
function section(rand: () => number): Float64Array {
  const r = 0.3 + 0.69 * rand(),
    th = Math.PI * rand();
  return Float64Array.of(rand() * 2 - 1, rand() * 2 - 1, rand() * 2 - 1, -2 * r * Math.cos(th), r * r);
}

function lcg(seed: number): () => number {
  let x = seed;
  return () => {
    x = (x * 1103515245 + 12345) % 2147483648;
    return x / 2147483648;
  };
}

describe('joined cascade', () => {
  it('gives the stages run one after the other, bit for bit', () => {
    const rand = lcg(7);
    for (let trial = 0; trial < 40; trial++) {
      const stageCount = 1 + Math.floor(rand() * 3);
      const make = () => {
        const r = lcg(100 + trial);
        return Array.from({ length: stageCount }, (_, s) => {
          const n = 1 + Math.floor(r() * 5);
          const coef = new Float64Array(5 * n);
          for (let k = 0; k < n; k++) coef.set(section(r), 5 * k);
          return new BiquadCascade(coef, s === 1 ? 1 : 0.1 + 3 * r());
        });
      };
      const input = Float64Array.from({ length: 3000 }, () => rand() * 2 - 1);
      const apart = input.slice(),
        joined = input.slice();
      const stages = make(),
        one = new JoinedCascade(make());
      // Blocks of uneven length, as a track's last block is.
      for (let s = 0; s < input.length; ) {
        const e = Math.min(input.length, s + 1 + Math.floor(rand() * 700));
        for (const st of stages) st.processInPlace(apart, s, e);
        one.processInPlace(joined, s, e);
        s = e;
      }
      for (let j = 0; j < input.length; j++) expect(Object.is(joined[j], apart[j]) || joined[j] === apart[j]).toBe(true);
    }
  });

  const examples = join(import.meta.dirname, '..', 'public', 'examples');
  const track = synthesizeDemoTrack(48000);
  const excerpt = track.channels.map((c) => c.slice(5 * 48000, 9 * 48000));
  // Designs without a room or passive network: their ways are cascades alone (none has a measured response).
  const plain = readdirSync(examples)
    .map((f) => parseDesign(JSON.parse(readFileSync(join(examples, f), 'utf8'))))
    .flatMap((r) => (r.ok ? [r.system] : []))
    .filter((s) => !s.listening.room && designLinearChain(s, 48000).every((w) => !w.passive));

  it('leaves the calibrated level of the example designs as the stages apart give it, bit for bit', () => {
    expect(plain.length).toBeGreaterThanOrEqual(3);
    for (const sys of plain) expect(seatLeqCPerVolt(sys, excerpt, 48000)).toBe(apartLevel(sys, excerpt));
  });
});

/** The calibration's level with the way's cascade and the C weighting run apart, blocks of 8192 frames. */
function apartLevel(sys: SpeakerSystem, channels: Float32Array[]): number {
  const ways = designLinearChain(sys, 48000);
  const nCh = channels.length;
  // A mono-sum pair's bass way plays the channels' mean, once.
  const lanes = ways.map((w) =>
    Array.from({ length: w.monoSum ? 1 : nCh }, () => [new BiquadCascade(w.coef, w.gain), cWeightingFilter(48000)]),
  );
  const frames = channels[0].length;
  const block = new Float64Array(8192);
  let energy = 0;
  for (let s = 0; s < frames; s += 8192) {
    const n = Math.min(8192, frames - s);
    for (let c = 0; c < nCh; c++)
      for (let w = 0; w < ways.length; w++) {
        if (c >= lanes[w].length) continue;
        for (let j = 0; j < n; j++) {
          if (!ways[w].monoSum) block[j] = channels[c][s + j];
          else {
            let sum = 0;
            for (let i = 0; i < nCh; i++) sum += channels[i][s + j];
            block[j] = sum / nCh;
          }
        }
        for (const st of lanes[w][c]) st.processInPlace(block, 0, n);
        for (let j = 0; j < n; j++) energy += block[j] * block[j];
      }
  }
  return splDbOfMeanSquare(energy / frames);
}
