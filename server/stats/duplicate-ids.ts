/**
 * How many accounts repeat an earlier account id: n − the number of distinct ids (exact).
 *
 * - duplicateIdsReference: the plain way, a Set of the ids. Exact; at a million ids it spends
 *   most of its time growing and rehashing the Set (seconds on a loaded machine, and a
 *   ten-million-entry Set needs hundreds of megabytes).
 * - duplicateIds (what the data-quality section runs): each id gets a 52-bit hash (two 32-bit
 *   multiplicative string hashes, FNV-1a style: Fowler, Noll & Vo, "FNV hash", IETF draft 2019),
 *   the hashes that occur more than once are found (repeatedHashes), and only ids with such a
 *   hash are compared as strings, in a Set per shared hash. Ids with different hashes are
 *   different, so the count is exact whatever the collisions; collisions only cost time.
 * - repeatedHashes: the hashes are grouped by their top 10 bits (one counting pass and one pass
 *   placing them), then each group, some ten thousand hashes at 10 million ids, goes through an
 *   open-addressing table small enough to stay in the cache. (A typed-array sort of all the
 *   hashes did the same in O(n log n), and was most of this section's time at 10 million rows.)
 *
 * Cost: O(n) expected on 8-byte numbers plus O(characters) hashing; tests/unit/stats/duplicate-ids
 * compares the two.
 */

export function duplicateIdsReference(ids: readonly string[]): number {
  const seen = new Set<string>();
  let repeats = 0;
  for (const id of ids) {
    if (seen.has(id)) repeats++;
    else seen.add(id);
  }
  return repeats;
}

const TWO_POW_20 = 1 << 20;

/** A 52-bit hash of a string, as a float64 integer. */
export function idHash(id: string): number {
  let h1 = 0x811c9dc5 | 0;
  let h2 = 0x01000193 ^ id.length;
  for (let i = 0; i < id.length; i++) {
    const c = id.charCodeAt(i);
    h1 = Math.imul(h1 ^ c, 0x01000193);
    h2 = Math.imul(h2 ^ c, 0x5bd1e995);
    h2 ^= h2 >>> 15;
  }
  h1 ^= h1 >>> 13;
  h1 = Math.imul(h1, 0x85ebca6b);
  h1 ^= h1 >>> 16;
  return (h1 >>> 0) * TWO_POW_20 + (h2 >>> 12);
}

/** `hash` is idHash; the tests pass weak ones to make ids collide. */
export function duplicateIds(ids: readonly string[], hashOf: (id: string) => number = idHash): number {
  const n = ids.length;
  const hashes = new Float64Array(n);
  for (let i = 0; i < n; i++) hashes[i] = hashOf(ids[i]);
  // Hashes that occur more than once: the only places where ids can repeat (repeatedHashes
  // reorders the array, so with any, the ids are hashed again below).
  const shared = repeatedHashes(hashes);
  if (shared.size === 0) return 0;
  const groups = new Map<number, Set<string>>();
  let repeats = 0;
  for (let i = 0; i < n; i++) {
    const hash = hashOf(ids[i]);
    if (!shared.has(hash)) continue;
    let group = groups.get(hash);
    if (group === undefined) {
      group = new Set<string>();
      groups.set(hash, group);
    }
    if (group.has(ids[i])) repeats++;
    else group.add(ids[i]);
  }
  return repeats;
}

const GROUP_BITS = 10;
const GROUP_SHIFT = 2 ** (52 - GROUP_BITS);
const EMPTY = -1;

/**
 * The values that occur more than once among integers in [0, 2^52) (idHash's hashes). The array
 * is reordered in place, by group (an in-place counting sort by the top bits, so no second array
 * of n numbers), then each group goes through the open-addressing table.
 */
export function repeatedHashes(hashes: Float64Array): Set<number> {
  const n = hashes.length;
  const groups = 1 << GROUP_BITS;
  const mask = groups - 1;
  // The group of a hash, its top bits, is written out in each loop.
  const end = new Uint32Array(groups + 1);
  for (let i = 0; i < n; i++) end[(Math.floor(hashes[i] / GROUP_SHIFT) & mask) + 1]++;
  let largest = 0;
  for (let g = 0; g < groups; g++) {
    largest = Math.max(largest, end[g + 1]);
    end[g + 1] += end[g];
  }
  // In place: each hash is carried to the next free place of its group, the one there carried on.
  const next = end.slice(0, groups);
  for (let g = 0; g < groups; g++) {
    while (next[g] < end[g + 1]) {
      let h = hashes[next[g]];
      let to = Math.floor(h / GROUP_SHIFT) & mask;
      while (to !== g) {
        const at = next[to]++;
        const displaced = hashes[at];
        hashes[at] = h;
        h = displaced;
        to = Math.floor(h / GROUP_SHIFT) & mask;
      }
      hashes[next[g]++] = h;
    }
  }
  // One table at least twice the largest group, of which each group uses a power of two.
  let capacity = 16;
  while (capacity < 2 * largest) capacity *= 2;
  const table = new Float64Array(capacity);
  const repeated = new Set<number>();
  for (let g = 0; g < groups; g++) {
    const from = end[g];
    const to = end[g + 1];
    let size = 16;
    while (size < 2 * (to - from)) size *= 2;
    const slots = size - 1;
    table.fill(EMPTY, 0, size);
    for (let at = from; at < to; at++) {
      const h = hashes[at];
      // The low bits of the hash pick the slot; linear probing.
      let slot = (h >>> 0) & slots;
      while (table[slot] !== EMPTY && table[slot] !== h) slot = (slot + 1) & slots;
      if (table[slot] === h) repeated.add(h);
      else table[slot] = h;
    }
  }
  return repeated;
}
