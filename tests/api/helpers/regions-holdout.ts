/**
 * A generated holdout where a further challenger is better than the champion overall but worse in
 * one segment value: 6,000 accounts in three regions (A, B, C in turn), weights 1 or 2 (every
 * fifth row 2), ids A0…; scores in points (higher is safer). "champion" and "c1" rank the same
 * risk with noise (c1 less noisy, better everywhere); "c2" ranks it with little noise in regions A
 * and C and hardly at all in region B. Seeded (mulberry32), so the same file every time.
 * Used by tests/api/challenger-segments.test.ts and tests/e2e/several-challengers.test.ts.
 */
export function regionsHoldoutCsv(): string {
  let state = 20240611;
  const uniform = () => {
    state = (state + 0x6d2b79f5) | 0;
    let x = Math.imul(state ^ (state >>> 15), 1 | state);
    x = (x + Math.imul(x ^ (x >>> 7), 61 | x)) ^ x;
    return ((x ^ (x >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  const lines = ['id,bad,champion,c1,c2,region,weight'];
  for (let i = 0; i < 6000; i++) {
    const region = ['A', 'B', 'C'][i % 3];
    const risk = normal();
    const bad = uniform() < 1 / (1 + Math.exp(2 - 1.3 * risk)) ? 1 : 0;
    const points = (value: number) => Math.round(600 - 40 * value);
    const champion = points(risk + 1.4 * normal());
    const c1 = points(risk + 1.0 * normal());
    const c2 = region === 'B' ? points(0.2 * risk + normal()) : points(risk + 0.4 * normal());
    lines.push(`A${i},${bad},${champion},${c1},${c2},${region},${i % 5 === 0 ? 2 : 1}`);
  }
  return lines.join('\n');
}
