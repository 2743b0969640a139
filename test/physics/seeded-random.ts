/**
 * A deterministic uniform generator on (0, 1) for seeded test samples (Park & Miller 1988 minimal
 * standard, multiplier 48271), so a sample is the same on every run and machine.
 */
export function seededRandom(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 48271) % 2147483647;
    return s / 2147483647;
  };
}
