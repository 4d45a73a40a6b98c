// Scoring a blind A/B/X trial: the exact binomial probability of doing at least this well by guessing.

/** ln(n choose k) by summing logs: exact enough for any trial length a person can sit through. */
function logChoose(n: number, k: number): number {
  let s = 0;
  for (let i = 1; i <= k; i++) s += Math.log(n - k + i) - Math.log(i);
  return s;
}

/** P(X >= correct) for X ~ Binomial(trials, p): the chance of scoring at least `correct` by guessing. */
export function probabilityAtLeast(correct: number, trials: number, p = 0.5): number {
  if (!Number.isInteger(trials) || trials < 0 || !Number.isInteger(correct))
    throw new RangeError('trials and correct must be whole numbers');
  if (correct <= 0) return 1;
  if (correct > trials) return 0;
  let sum = 0;
  for (let k = correct; k <= trials; k++) {
    sum += Math.exp(logChoose(trials, k) + k * Math.log(p) + (trials - k) * Math.log1p(-p));
  }
  return Math.min(1, sum);
}
