import fc from 'fast-check';
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { duplicateIds, duplicateIdsReference, idHash } from '@server/stats/duplicate-ids';

describe('duplicate account ids', () => {
  it('are counted as the plain Set count does (random ids with repeats)', () => {
    fc.assert(
      fc.property(fc.array(fc.string({ maxLength: 4 }), { maxLength: 300 }), (ids) => {
        expect(duplicateIds(ids)).toBe(duplicateIdsReference(ids));
      }),
      { numRuns: 500 },
    );
  });

  it('stay exact when different ids share a hash (weak hashes force collisions)', () => {
    const random = seedrandom('ids');
    const ids = Array.from({ length: 5000 }, () => `A${Math.floor(random() * 3000)}`);
    const expected = duplicateIdsReference(ids);
    expect(expected).toBeGreaterThan(1000);
    expect(duplicateIds(ids, (id) => id.length)).toBe(expected);
    expect(duplicateIds(ids, () => 7)).toBe(expected);
    expect(duplicateIds(ids)).toBe(expected);
  });

  it('count none among 200,000 distinct ids, and every repeat of a repeated one', () => {
    const ids = Array.from({ length: 200_000 }, (_, i) => `ACC-${i.toString(36)}`);
    expect(duplicateIds(ids)).toBe(0);
    ids.push('ACC-0', 'ACC-0', 'ACC-1', '');
    ids.push('');
    expect(duplicateIds(ids)).toBe(duplicateIdsReference(ids));
    expect(duplicateIds(ids)).toBe(4);
  });

  it('hash to 52-bit integers', () => {
    for (const id of ['', 'a', 'A123456', 'é-ü-漢字']) {
      const h = idHash(id);
      expect(Number.isInteger(h) && h >= 0 && h < 2 ** 52).toBe(true);
    }
    expect(idHash('ab')).not.toBe(idHash('ba'));
  });
});
