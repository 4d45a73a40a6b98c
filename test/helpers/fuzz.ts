// Sizing of property and fuzz runs: small in `npm test`, large in `npm run fuzz` (FUZZ_RUNS).
export const runs = (normal: number): number => {
  const env = Number(process.env.FUZZ_RUNS);
  return Number.isFinite(env) && env > 0 ? env : normal;
};
export const FUZZ_SEED = Number(process.env.FUZZ_SEED ?? 20261201);
