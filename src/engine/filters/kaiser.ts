// The Kaiser window's Bessel function (Kaiser, "Nonrecursive digital filter design using the
// I0-sinh window function", 1974): one definition for every windowed-sinc design here.

/** The modified Bessel function of the first kind, order 0, by its power series. */
export function besselI0(x: number): number {
  let sum = 1,
    term = 1;
  for (let k = 1; k < 50; k++) {
    term *= (x / (2 * k)) * (x / (2 * k));
    sum += term;
    if (term < 1e-17 * sum) break;
  }
  return sum;
}
