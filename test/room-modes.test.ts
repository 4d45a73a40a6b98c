// The room's modal sum against references written here, independent of src/engine/room.
import { describe, expect, it } from 'vitest';
import type { Listening, Room, Vec3 } from '../src/engine/system.ts';
import { modalSumAt, modeHz, reverberation, roomModel, roomModes, schroederHz } from '../src/engine/room/modes.ts';
import { airAt } from '../src/engine/air.ts';

const air = airAt(20, 101.325);
const c = air.c;
const rho = air.rho;

function listening(room: Room): Listening {
  return { distance: 1, space: 'half', omega: 2 * Math.PI, channels: 'pair', level: { mode: 'spl', splDb: 85 }, roomGainHz: 0, room };
}

function livingRoom(alpha: number, speaker: Vec3 = [0.7, 1.1, 0.4], seat: Vec3 = [3.3, 1.7, 1.1]): Room {
  const s = { floor: alpha, ceiling: alpha, front: alpha, back: alpha, left: alpha, right: alpha };
  return { size: [5, 4, 2.5], speakers: [speaker], seat, absorption: s };
}

describe('room modes', () => {
  it('are every (nx, ny, nz) under the limit at c/2·sqrt((nx/Lx)^2 + (ny/Ly)^2 + (nz/Lz)^2), lowest first', () => {
    const size: Vec3 = [5, 4, 2.5];
    const modes = roomModes(size, c, 120);
    // Reference: every index triple by brute force (the rectangular room's eigenfrequencies, Morse and Ingard ch. 9).
    const ref: number[] = [];
    for (let nx = 0; nx < 20; nx++)
      for (let ny = 0; ny < 20; ny++)
        for (let nz = 0; nz < 20; nz++) {
          const f = (c / 2) * Math.sqrt((nx / 5) ** 2 + (ny / 4) ** 2 + (nz / 2.5) ** 2);
          if (f <= 120) ref.push(f);
        }
    ref.sort((a, b) => a - b);
    expect(modes.map((m) => m.hz)).toEqual(ref);
    for (const m of modes) expect(m.hz).toBe(modeHz(c, size, m.nx, m.ny, m.nz));
    // The axial modes of a 5 x 4 x 2.5 m room at c = 343.2 m/s: c/10, c/8, c/5.
    expect(modes[1]).toMatchObject({ nx: 1, ny: 0, nz: 0 });
    expect(modes[1].hz).toBeCloseTo(c / 10, 12);
    expect(modes[2]).toMatchObject({ nx: 0, ny: 1, nz: 0 });
    expect(modes[2].hz).toBeCloseTo(c / 8, 12);
    expect(modes.find((m) => m.nx === 0 && m.ny === 0 && m.nz === 1)!.hz).toBeCloseTo(c / 5, 12);
  });

  it('decay by Eyring and give the Schroeder frequency 2000·sqrt(T60/V)', () => {
    const r = reverberation(livingRoom(0.15), c);
    // Eyring (1930): T = 0.161·V/(-S ln(1 - alpha)) with 0.161 = 24 ln10/c at c ≈ 343 m/s.
    const s = 2 * (5 * 4 + 5 * 2.5 + 4 * 2.5);
    expect(r.t60).toBeCloseTo((24 * Math.LN10 * 50) / (c * -s * Math.log(0.85)), 10);
    expect(r.t60).toBeCloseTo((0.161 * 50) / (-s * Math.log(0.85)), 2);
    expect(schroederHz(r.t60, 50)).toBeCloseTo(2000 * Math.sqrt(r.t60 / 50), 10);
  });

  it('match an image-source computation of the same rigid-walled room within 1 dB below the Schroeder frequency, away from nulls', () => {
    // Reference: the image method of Allen and Berkley (JASA 65(4), 1979) for a rigid rectangular
    // room (every reflection factor 1), the images at (±xs + 2l·Lx, ±ys + 2m·Ly, ±zs + 2n·Lz). The
    // response is windowed by e^(-delta·t), the decay of the modal model, so that a steady state
    // exists: the transform of the windowed response is the rigid room's at w - j·delta,
    //   p/Q = rho·(jw + delta)·sum e^(-(jw + delta)·R/c) / (4 pi R).
    const room = livingRoom(0.3);
    const model = roomModel(listening(room), air)!;
    const { delta } = model.reverb;
    const fS = model.schroederHz;
    const src = room.speakers[0];
    const rcv = room.seat;
    const [lx, ly, lz] = room.size;
    const f0 = 25;
    const df = 0.5;
    const nf = Math.floor((fS - f0) / df) + 1;
    const re = new Float64Array(nf);
    const im = new Float64Array(nf);
    // Images until their weight e^(-delta R/c) falls under 1e-7.
    const rMax = (c * Math.log(1e7)) / delta;
    const lMax = (l: number) => Math.ceil(rMax / (2 * l)) + 1;
    for (let u = 0; u < 2; u++)
      for (let v = 0; v < 2; v++)
        for (let w = 0; w < 2; w++)
          for (let l = -lMax(lx); l <= lMax(lx); l++)
            for (let m = -lMax(ly); m <= lMax(ly); m++)
              for (let n = -lMax(lz); n <= lMax(lz); n++) {
                const dx = (1 - 2 * u) * src[0] + 2 * l * lx - rcv[0];
                const dy = (1 - 2 * v) * src[1] + 2 * m * ly - rcv[1];
                const dz = (1 - 2 * w) * src[2] + 2 * n * lz - rcv[2];
                const r = Math.hypot(dx, dy, dz);
                if (r > rMax) continue;
                const amp = Math.exp((-delta * r) / c) / (4 * Math.PI * r);
                // e^(-j w R/c) stepped along the frequency grid by one rotation.
                const th0 = (-2 * Math.PI * f0 * r) / c;
                const dth = (-2 * Math.PI * df * r) / c;
                let cr = amp * Math.cos(th0);
                let ci = amp * Math.sin(th0);
                const sr = Math.cos(dth);
                const si = Math.sin(dth);
                for (let k = 0; k < nf; k++) {
                  re[k] += cr;
                  im[k] += ci;
                  const t = cr * sr - ci * si;
                  ci = cr * si + ci * sr;
                  cr = t;
                }
              }
    const refDb = new Float64Array(nf);
    const gotDb = new Float64Array(nf);
    for (let k = 0; k < nf; k++) {
      const wk = 2 * Math.PI * (f0 + k * df);
      // rho·(jw + delta)·S
      refDb[k] = 20 * Math.log10(rho * Math.hypot(delta, wk) * Math.hypot(re[k], im[k]));
      // The model gives H = p/p_d with p_d = jw·rho·Q/(Omega·r_d): p/Q = H·w·rho/(Omega·r_d).
      const h = modalSumAt(model.paths[0], wk);
      gotDb[k] = 20 * Math.log10((Math.hypot(h.re, h.im) * wk * rho) / (2 * Math.PI * 1));
    }
    const sorted = [...refDb].sort((a, b) => a - b);
    const median = sorted[Math.floor(nf / 2)];
    let worst = 0;
    let compared = 0;
    for (let k = 0; k < nf; k++) {
      // Away from nulls: points more than 10 dB under the band's median level are left out.
      if (refDb[k] < median - 10) continue;
      compared++;
      worst = Math.max(worst, Math.abs(gotDb[k] - refDb[k]));
    }
    if (process.env.ROOM_DEBUG)
      for (let k = 0; k < nf; k += 8) console.log((f0 + k * df).toFixed(1), refDb[k].toFixed(2), (gotDb[k] - refDb[k]).toFixed(2));
    expect(compared).toBeGreaterThan(0.8 * nf);
    expect(worst).toBeLessThan(1);
    console.log(
      `fS ${fS.toFixed(1)} Hz, T60 ${model.reverb.t60.toFixed(3)} s, ${model.modes.length} modes, worst ${worst.toFixed(3)} dB over ${compared}/${nf}`,
    );
  });
});
