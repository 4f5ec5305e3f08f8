/**
 * How many accounts repeat an earlier account id: n − the number of distinct ids (exact).
 *
 * - duplicateIdsReference: the plain way, a Set of the ids. Exact; at a million ids it spends
 *   most of its time growing and rehashing the Set (seconds on a loaded machine, and a
 *   ten-million-entry Set needs hundreds of megabytes).
 * - duplicateIds (what the data-quality section runs): each id gets a 52-bit hash (two 32-bit
 *   multiplicative string hashes, FNV-1a style: Fowler, Noll & Vo, "FNV hash", IETF draft 2019),
 *   the hashes are sorted (a typed-array sort), and only ids whose hash occurs more than once are
 *   compared as strings, in a Set per shared hash. Ids with different hashes are different, so
 *   the count is exact whatever the collisions; collisions only cost time.
 *
 * Cost: O(n log n) on 8-byte numbers plus O(characters) hashing; tests/unit/stats/duplicate-ids
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
export function duplicateIds(ids: readonly string[], hash: (id: string) => number = idHash): number {
  const n = ids.length;
  const hashes = new Float64Array(n);
  for (let i = 0; i < n; i++) hashes[i] = hash(ids[i]);
  const sorted = Float64Array.from(hashes).sort();
  // Hashes that occur more than once: the only places where ids can repeat.
  const shared = new Set<number>();
  for (let k = 1; k < n; k++) if (sorted[k] === sorted[k - 1]) shared.add(sorted[k]);
  if (shared.size === 0) return 0;
  const groups = new Map<number, Set<string>>();
  let repeats = 0;
  for (let i = 0; i < n; i++) {
    const hash = hashes[i];
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
