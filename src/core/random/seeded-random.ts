/**
 * The project's one seeded generator (mulberry32: 32-bit state, uniform on [0, 1) in steps of
 * 2⁻³²). Demo data, simulated sweeps, test fixtures and benches draw from it so a seed gives
 * the same numbers on every machine and run. Not for anything secret.
 */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
