// The bootstrap's four-lane kernel, in AssemblyScript (compiled to WebAssembly with SIMD by
// scripts/build-wasm.mjs; the TypeScript side is server/stats/bootstrap-lanes.ts, which says what
// each pass is for). Four replicates at once, one per 32-bit lane of a 128-bit vector: lane l runs
// replicate r + l's own xoshiro128** stream, so every count is the one the single-replicate
// kernel (server/stats/bootstrap-kernel.ts) draws for that replicate, and the tests compare the
// two replicate by replicate. Memory is laid out by the TypeScript side; every function takes the
// byte offsets of its arrays. Counts are four 16-bit values side by side per cell (8 bytes);
// running totals and block totals four 32-bit values side by side (16 bytes).

const GUIDE: i32 = 32;
const TABLE_MAX: i32 = 64;
const INV_TWO_POW_32: f64 = 1.0 / 4294967296.0;

// Poisson(λ) by inversion of u, λ ≤ 64: from the start of the λ = 1 table, or from the guide
// entry of λ's table (the steps of poissonLarge in bootstrap-poisson.ts).
function invert(u: f64, lambda: i32, cdf: usize, offset: usize, guide: usize): i32 {
  let j: u32 = 0;
  if (lambda == 1) {
    while (u >= load<f64>(cdf + (<usize>j << 3))) j++;
  } else {
    const base = load<u32>(offset + (<usize>lambda << 2));
    j = load<u32>(guide + (<usize>(lambda * GUIDE + <i32>(u * <f64>GUIDE)) << 2));
    while (u >= load<f64>(cdf + (<usize>(base + j) << 3))) j++;
  }
  return <i32>j;
}

// Poisson(size) counts for every cell, four replicates: drawPoissonCountsOnly of
// bootstrap-poisson.ts in each lane. `state`: the four state vectors (in and out); `work`: 32
// bytes of scratch; totals written at `totals`: good draws (4 × i32), bad draws (4 × i32), largest
// count of a one-account cell (4 × i32), largest count/size of a larger cell (4 × f64).
// t0…t5: ⌈cdf_k·2^32⌉ of Poisson(1), k = 0…5, as unsigned integers.
export function drawFour(
  cells: i32, size: usize, flags: usize, counts: usize, state: usize, work: usize, totals: usize,
  cdf: usize, offset: usize, guide: usize,
  t0: u32, t1: u32, t2: u32, t3: u32, t4: u32, t5: u32,
): void {
  let s0 = v128.load(state);
  let s1 = v128.load(state, 16);
  let s2 = v128.load(state, 32);
  let s3 = v128.load(state, 48);
  const T0 = i32x4.splat(t0);
  const T1 = i32x4.splat(t1);
  const T2 = i32x4.splat(t2);
  const T3 = i32x4.splat(t3);
  const T4 = i32x4.splat(t4);
  const T5 = i32x4.splat(t5);
  const five = i32x4.splat(5);
  const nine = i32x4.splat(9);
  const six = i32x4.splat(6);
  let good = i32x4.splat(0);
  let bad = i32x4.splat(0);
  let maxOne = i32x4.splat(0);
  const kAt = work; // 16 bytes: the four counts
  const rAt = work + 16; // 16 bytes: the four generator outputs
  const ratio = totals + 48; // 4 × f64
  for (let l: usize = 0; l < 4; l++) store<f64>(ratio + (l << 3), 0.0);
  for (let c: usize = 0; c < <usize>cells; c++) {
    const cellSize = <i32>load<u8>(size + c);
    let k: v128;
    if (cellSize == 1) {
      const x = i32x4.mul(s1, five);
      const r = i32x4.mul(v128.or(i32x4.shl(x, 7), i32x4.shr_u(x, 25)), nine);
      const t = i32x4.shl(s1, 9);
      s2 = v128.xor(s2, s0);
      s3 = v128.xor(s3, s1);
      s1 = v128.xor(s1, s2);
      s0 = v128.xor(s0, s3);
      s2 = v128.xor(s2, t);
      s3 = v128.or(i32x4.shl(s3, 11), i32x4.shr_u(s3, 21));
      // Each comparison is all ones (−1) where true: the count is minus their sum.
      const m01 = i32x4.add(i32x4.ge_u(r, T0), i32x4.ge_u(r, T1));
      const m23 = i32x4.add(i32x4.ge_u(r, T2), i32x4.ge_u(r, T3));
      const m45 = i32x4.add(i32x4.ge_u(r, T4), i32x4.ge_u(r, T5));
      k = i32x4.neg(i32x4.add(i32x4.add(m01, m23), m45));
      if (v128.any_true(i32x4.eq(k, six))) {
        // Rare (6 or more, 1 in 1,700 per lane): the rest of the inversion in that lane.
        v128.store(kAt, k);
        v128.store(rAt, r);
        for (let l: usize = 0; l < 4; l++) {
          let kl = load<i32>(kAt + (l << 2));
          if (kl == 6) {
            const u = <f64>load<u32>(rAt + (l << 2)) * INV_TWO_POW_32;
            while (u >= load<f64>(cdf + (<usize>kl << 3))) kl++;
            store<i32>(kAt + (l << 2), kl);
          }
        }
        k = v128.load(kAt);
      }
      maxOne = i32x4.max_s(maxOne, k);
    } else {
      // A cell of several accounts: Poisson(size) as Poisson(64) chunks and a remainder, each
      // step one generator output per lane (the vector step), inverted lane by lane.
      v128.store(kAt, i32x4.splat(0));
      let m = cellSize;
      while (true) {
        const x = i32x4.mul(s1, five);
        const r = i32x4.mul(v128.or(i32x4.shl(x, 7), i32x4.shr_u(x, 25)), nine);
        const t = i32x4.shl(s1, 9);
        s2 = v128.xor(s2, s0);
        s3 = v128.xor(s3, s1);
        s1 = v128.xor(s1, s2);
        s0 = v128.xor(s0, s3);
        s2 = v128.xor(s2, t);
        s3 = v128.or(i32x4.shl(s3, 11), i32x4.shr_u(s3, 21));
        v128.store(rAt, r);
        const lambda = m > TABLE_MAX ? TABLE_MAX : m;
        for (let l: usize = 0; l < 4; l++) {
          const u = <f64>load<u32>(rAt + (l << 2)) * INV_TWO_POW_32;
          store<i32>(kAt + (l << 2), load<i32>(kAt + (l << 2)) + invert(u, lambda, cdf, offset, guide));
        }
        if (m <= TABLE_MAX) break;
        m -= TABLE_MAX;
      }
      k = v128.load(kAt);
      for (let l: usize = 0; l < 4; l++) {
        const q = <f64>load<i32>(kAt + (l << 2)) / <f64>cellSize;
        if (q > load<f64>(ratio + (l << 3))) store<f64>(ratio + (l << 3), q);
      }
    }
    v128.store64_lane(counts + (c << 3), i16x8.narrow_i32x4_u(k, k), 0);
    const isBad = i32x4.splat(<i32>(load<u8>(flags + c) & 1));
    const kBad = i32x4.mul(k, isBad);
    bad = i32x4.add(bad, kBad);
    good = i32x4.add(good, i32x4.sub(k, kBad));
  }
  v128.store(state, s0);
  v128.store(state, s1, 16);
  v128.store(state, s2, 32);
  v128.store(state, s3, 48);
  v128.store(totals, good);
  v128.store(totals, bad, 16);
  v128.store(totals, maxOne, 32);
}

// Running totals of goods and bads of the four replicates at each cell, in slot j (16 bytes each)
// until the block's last cell (flags bit 1) moves j on: blockTotals of bootstrap-score.ts, four
// lanes at once. Returns the number of blocks.
export function totalsFour(cells: i32, flags: usize, counts: usize, good: usize, bad: usize): i32 {
  let g = i32x4.splat(0);
  let b = i32x4.splat(0);
  let at: usize = 0;
  for (let c: usize = 0; c < <usize>cells; c++) {
    const f = <u32>load<u8>(flags + c);
    const k = i32x4.extend_low_i16x8_u(v128.load64_zero(counts + (c << 3)));
    const kBad = i32x4.mul(k, i32x4.splat(<i32>(f & 1)));
    b = i32x4.add(b, kBad);
    g = i32x4.add(g, i32x4.sub(k, kBad));
    v128.store(good + at, g);
    v128.store(bad + at, b);
    at += <usize>((f >> 1) << 4);
  }
  return <i32>(at >> 4);
}

// The four replicates' counts into another model's order: target + 8·position[c] (u32 positions).
export function scatterFour(cells: i32, position: usize, counts: usize, target: usize): void {
  for (let c: usize = 0; c < <usize>cells; c++) {
    store<u64>(target + (<usize>load<u32>(position + (c << 2)) << 3), load<u64>(counts + (c << 3)));
  }
}

// The four replicates' block totals: total key[c] (16 bytes each) += the cell's counts. The
// totals must be zero on entry.
export function blockTotalsFour(cells: i32, key: usize, counts: usize, totals: usize): void {
  for (let c: usize = 0; c < <usize>cells; c++) {
    const at = totals + (<usize>load<u32>(key + (c << 2)) << 4);
    const k = i32x4.extend_low_i16x8_u(v128.load64_zero(counts + (c << 3)));
    v128.store(at, i32x4.add(v128.load(at), k));
  }
}

// AUC and KS sums of the four replicates from running totals at block ends (totalsFour's good and
// bad): blockSums of bootstrap-score.ts in each lane, in exact 64-bit integers. Writes, per lane,
// 2·wins, the largest and the smallest of bads·nGood − goods·nBad (12 f64 at `out`: lane l's at
// 8·(3l), 8·(3l + 1), 8·(3l + 2)); every value is an integer below 2^53, so as an f64 it is exact.
export function sumsFour(blocks: i32, good: usize, bad: usize, goods: i32, bads: i32, out: usize): void {
  const nGood = <i64>goods;
  const nBad = <i64>bads;
  for (let l: usize = 0; l < 4; l++) {
    let previousGood: i64 = 0;
    let previousBad: i64 = 0;
    let wins2: i64 = 0;
    let high: i64 = 0;
    let low: i64 = 0;
    for (let j: usize = 0; j < <usize>blocks; j++) {
      const at = (j << 4) + (l << 2);
      const g = <i64>load<i32>(good + at);
      const b = <i64>load<i32>(bad + at);
      wins2 += (g - previousGood) * (previousBad + b);
      previousGood = g;
      previousBad = b;
      const d = b * nGood - g * nBad;
      high = select<i64>(d, high, d > high);
      low = select<i64>(d, low, d < low);
    }
    store<f64>(out + l * 24, <f64>wins2);
    store<f64>(out + l * 24 + 8, <f64>high);
    store<f64>(out + l * 24 + 16, <f64>low);
  }
}

// The same sums from the four replicates' block totals (blockTotalsFour: the goods of block j at
// 32·j, its bads at 32·j + 16): scoreBlockCounts of bootstrap-score.ts in each lane.
export function blockSumsFour(blocks: i32, totals: usize, goods: i32, bads: i32, out: usize): void {
  const nGood = <i64>goods;
  const nBad = <i64>bads;
  for (let l: usize = 0; l < 4; l++) {
    let totalGood: i64 = 0;
    let totalBad: i64 = 0;
    let wins2: i64 = 0;
    let high: i64 = 0;
    let low: i64 = 0;
    for (let j: usize = 0; j < <usize>blocks; j++) {
      const at = totals + (j << 5) + (l << 2);
      const g = <i64>load<u32>(at);
      const b = <i64>load<u32>(at, 16);
      wins2 += g * (2 * totalBad + b);
      totalGood += g;
      totalBad += b;
      const d = totalBad * nGood - totalGood * nBad;
      high = select<i64>(d, high, d > high);
      low = select<i64>(d, low, d < low);
    }
    store<f64>(out + l * 24, <f64>wins2);
    store<f64>(out + l * 24 + 8, <f64>high);
    store<f64>(out + l * 24 + 16, <f64>low);
  }
}

// With sampling weights: pass 1 of scoreCellsWeighted (bootstrap-score.ts) in each lane, the same
// double-precision operations in the same order (so the same bits): each cell's weight times its
// count, to the replicate's total good and bad weight and to its block's good and bad weight,
// written in slot j (32 bytes: lanes 0 … 3 as f64) until the block's last cell moves j on, the
// block's sums starting again from 0 after it. Totals at `totals`: good (4 × f64), bad (4 × f64).
// Returns the number of blocks.
export function weightedTotalsFour(cells: i32, flags: usize, counts: usize, weight: usize, good: usize, bad: usize, totals: usize): i32 {
  let totalGood01 = f64x2.splat(0.0);
  let totalGood23 = f64x2.splat(0.0);
  let totalBad01 = f64x2.splat(0.0);
  let totalBad23 = f64x2.splat(0.0);
  let goods01 = f64x2.splat(0.0);
  let goods23 = f64x2.splat(0.0);
  let bads01 = f64x2.splat(0.0);
  let bads23 = f64x2.splat(0.0);
  let at: usize = 0;
  for (let c: usize = 0; c < <usize>cells; c++) {
    const f = <u32>load<u8>(flags + c);
    const w = f64x2.splat(load<f64>(weight + (c << 3)));
    const k = i32x4.extend_low_i16x8_u(v128.load64_zero(counts + (c << 3)));
    const k01 = f64x2.convert_low_i32x4_u(k);
    const k23 = f64x2.convert_low_i32x4_u(i32x4.shuffle(k, k, 2, 3, 0, 1));
    const w01 = f64x2.mul(k01, w);
    const w23 = f64x2.mul(k23, w);
    const isBad = f64x2.splat(<f64>(f & 1));
    const bad01 = f64x2.mul(w01, isBad);
    const bad23 = f64x2.mul(w23, isBad);
    const good01 = f64x2.sub(w01, bad01);
    const good23 = f64x2.sub(w23, bad23);
    totalBad01 = f64x2.add(totalBad01, bad01);
    totalBad23 = f64x2.add(totalBad23, bad23);
    totalGood01 = f64x2.add(totalGood01, good01);
    totalGood23 = f64x2.add(totalGood23, good23);
    bads01 = f64x2.add(bads01, bad01);
    bads23 = f64x2.add(bads23, bad23);
    goods01 = f64x2.add(goods01, good01);
    goods23 = f64x2.add(goods23, good23);
    v128.store(good + at, goods01);
    v128.store(good + at, goods23, 16);
    v128.store(bad + at, bads01);
    v128.store(bad + at, bads23, 16);
    const end = f >> 1;
    at += <usize>(end << 5);
    const keep = f64x2.splat(<f64>(1 - end));
    goods01 = f64x2.mul(goods01, keep);
    goods23 = f64x2.mul(goods23, keep);
    bads01 = f64x2.mul(bads01, keep);
    bads23 = f64x2.mul(bads23, keep);
  }
  v128.store(totals, totalGood01);
  v128.store(totals, totalGood23, 16);
  v128.store(totals, totalBad01, 32);
  v128.store(totals, totalBad23, 48);
  return <i32>(at >> 5);
}

// Pass 2 of scoreCellsWeighted in each lane, from weightedTotalsFour's block weights and totals
// (at `totals`): writes per lane the wins and the largest gap (8 f64 at `out`: lane l's at 16·l).
export function weightedSumsFour(blocks: i32, good: usize, bad: usize, totals: usize, out: usize): void {
  for (let l: usize = 0; l < 4; l++) {
    const totalGood = load<f64>(totals + (l << 3));
    const totalBad = load<f64>(totals + 32 + (l << 3));
    let cumGood = 0.0;
    let cumBad = 0.0;
    let wins = 0.0;
    let gap = 0.0;
    for (let j: usize = 0; j < <usize>blocks; j++) {
      const at = (j << 5) + (l << 3);
      const g = load<f64>(good + at);
      const b = load<f64>(bad + at);
      wins += g * (cumBad + b * 0.5);
      cumBad += b;
      cumGood += g;
      const d = cumBad * totalGood - cumGood * totalBad;
      const absolute = d < 0.0 ? -d : d;
      if (absolute > gap) gap = absolute;
    }
    store<f64>(out + (l << 4), wins);
    store<f64>(out + (l << 4) + 8, gap);
  }
}
