// The minimum-phase response that goes with a magnitude response, by the real cepstrum (the
// homomorphic method: Oppenheim & Schafer, Discrete-Time Signal Processing, the chapter on
// cepstrum analysis): c = IFFT(ln|H|); fold c onto n >= 0 (c[0], 2·c[n] for 0 < n < N/2, c[N/2]);
// H_min = exp(FFT(folded)). The building block for a measured response used as an FIR; the grid
// must be dense enough that the cepstrum has died out by N/2 (time aliasing otherwise).
import FFT from 'fft.js';

export interface HalfSpectrum {
  /** Bins k = 0..N/2 of an N-point FFT grid. */
  re: Float64Array;
  im: Float64Array;
}

/** Smallest magnitude taken, so a null in a measurement does not become -Infinity in the log. */
const FLOOR = 1e-9;

/** `magnitude` on bins 0..N/2 (N a power of two, at least 16); returns the minimum-phase spectrum there. */
export function minimumPhaseSpectrum(magnitude: ArrayLike<number>): HalfSpectrum {
  const half = magnitude.length - 1;
  const n = 2 * half;
  if (n < 16 || (n & (n - 1)) !== 0) throw new Error('the magnitude grid must have N/2 + 1 bins with N a power of two, at least 16');
  const fft = new FFT(n);
  const logSpectrum = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    const m = magnitude[k <= half ? k : n - k];
    logSpectrum[2 * k] = Math.log(Math.max(Number.isFinite(m) ? m : FLOOR, FLOOR));
    logSpectrum[2 * k + 1] = 0;
  }
  const cepstrum = new Float64Array(2 * n);
  // fft.js's inverse transform includes the 1/N.
  fft.inverseTransform(cepstrum, logSpectrum);
  const folded = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const w = i === 0 || i === half ? 1 : i < half ? 2 : 0;
    folded[2 * i] = w * cepstrum[2 * i];
    folded[2 * i + 1] = 0;
  }
  const logMin = new Float64Array(2 * n);
  fft.transform(logMin, folded);
  const re = new Float64Array(half + 1);
  const im = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) {
    const mag = Math.exp(logMin[2 * k]);
    re[k] = mag * Math.cos(logMin[2 * k + 1]);
    im[k] = mag * Math.sin(logMin[2 * k + 1]);
  }
  return { re, im };
}
