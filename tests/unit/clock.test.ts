import { describe, expect, it } from 'vitest';
import { atMoment, now, replay } from '@server/clock';

// server/clock.ts: the running time, the demo seed's replay, and a moment held for one unit of work.

describe('the clock', () => {
  it('holds now() at a moment for the work inside atMoment only, across awaits, while other work keeps the running time', async () => {
    const moment = new Date('2025-03-04T05:06:07.089Z');
    let outside: Date | null = null;
    const held = atMoment(moment, async () => {
      const first = now();
      await new Promise((resolve) => setTimeout(resolve, 30));
      return [first, now()];
    });
    // Meanwhile, outside the held unit, the time runs.
    await new Promise((resolve) => setTimeout(resolve, 10));
    outside = now();
    const [first, second] = await held;
    expect(first.toISOString()).toBe(moment.toISOString());
    expect(second.toISOString()).toBe(moment.toISOString());
    expect(Math.abs(outside.getTime() - Date.now())).toBeLessThan(1_000);
    // Each call gives its own Date: changing one does not move the held moment.
    first.setFullYear(1999);
    expect(await atMoment(moment, async () => now().toISOString())).toBe(moment.toISOString());
  });

  it('runs on at the real pace inside a replay, and is the real time again afterwards', async () => {
    const from = new Date(Date.now() - 86_400_000);
    await replay(from, async (advanceTo) => {
      expect(Math.abs(now().getTime() - from.getTime())).toBeLessThan(1_000);
      const later = new Date(from.getTime() + 3_600_000);
      advanceTo(later);
      expect(now().getTime()).toBeGreaterThanOrEqual(later.getTime());
    });
    expect(Math.abs(now().getTime() - Date.now())).toBeLessThan(1_000);
  });
});
