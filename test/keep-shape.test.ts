// keepShape keeps the newest object of each class alive (so V8 keeps the class's shape between
// renders) and lets every older one go, so nothing piles up render after render.
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { describe, expect, it } from 'vitest';
import { BiquadCascade } from '../src/engine/filters/biquad.ts';
import { keepShape } from '../src/engine/keep-shape.ts';

setFlagsFromString('--expose-gc');
const gc = runInNewContext('gc') as () => void;
// A WeakRef made in this turn of the event loop holds its object until the turn ends.
const nextTurn = () => new Promise((r) => setTimeout(r, 0));

class Probe {
  constructor(readonly id: number) {
    keepShape(this);
  }
}

describe('keepShape', () => {
  it('keeps the newest object of a class and releases the older ones', async () => {
    const refs = [0, 1, 2].map((id) => new WeakRef(new Probe(id)));
    const sections = [0, 1].map(() => new WeakRef(new BiquadCascade(Float64Array.of(1, 0, 0, 0, 0))));
    await nextTurn();
    for (let k = 0; k < 3; k++) gc();
    await nextTurn();
    expect(refs.map((r) => r.deref()?.id)).toEqual([undefined, undefined, 2]);
    expect(sections.map((r) => r.deref() !== undefined)).toEqual([false, true]);
  });
});
