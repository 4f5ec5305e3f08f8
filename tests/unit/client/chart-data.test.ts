import { describe, expect, it } from 'vitest';
import { curveTable, gridSteps, histogramBins, histogramTotal, interpolateAt, ksMarker, ksTable, positionInHistogram, thin } from '@/features/curves/lib/chart-data';

// Expected values computed by hand from the small inputs beside each assertion.

describe('curve points for tables', () => {
  const curve = [
    { x: 0, y: 0 },
    { x: 0, y: 0.2 },
    { x: 0.5, y: 0.7 },
    { x: 1, y: 1 },
  ];

  it('interpolates linearly between points and takes the top of a vertical step', () => {
    expect(interpolateAt(curve, 0)).toBe(0.2); // x = 0 appears twice; the later point wins
    expect(interpolateAt(curve, 0.25)).toBeCloseTo(0.45, 12); // halfway from 0.2 to 0.7
    expect(interpolateAt(curve, 0.75)).toBeCloseTo(0.85, 12); // halfway from 0.7 to 1
    expect(interpolateAt(curve, 1)).toBe(1);
    expect(interpolateAt(curve, 2)).toBe(1);
    expect(interpolateAt([], 0.5)).toBeNull();
  });

  it('makes a grid without floating-point drift', () => {
    const steps = gridSteps(0.05);
    expect(steps).toHaveLength(21);
    expect(steps[3]).toBe(0.15);
    expect(steps[20]).toBe(1);
  });

  it('tabulates both models at every step', () => {
    const rows = curveTable({ champion: curve, challenger: [{ x: 0, y: 0 }, { x: 1, y: 1 }] }, 0.25);
    expect(rows.map((row) => row.x)).toEqual([0, 0.25, 0.5, 0.75, 1]);
    expect(rows[1].champion).toBeCloseTo(0.45, 12);
    expect(rows[1].challenger).toBeCloseTo(0.25, 12);
  });
});

describe('the KS marker', () => {
  const points = [
    { score: 400, cumBad: 0.1, cumGood: 0.01 },
    { score: 500, cumBad: 0.5, cumGood: 0.1 },
    { score: 550, cumBad: 0.7, cumGood: 0.35 },
    { score: 600, cumBad: 0.9, cumGood: 0.6 },
    { score: 700, cumBad: 1, cumGood: 1 },
  ];

  it('marks the point at the report\'s KS score', () => {
    // gaps: 0.09, 0.4, 0.35, 0.3, 0 — but the report found its KS at 550 (on every account).
    expect(ksMarker(points, 550)).toMatchObject({ score: 550, gap: expect.closeTo(0.35, 12) });
  });

  it('falls back to the largest drawn gap when the KS score was thinned away', () => {
    expect(ksMarker(points, 512)).toMatchObject({ score: 500, gap: expect.closeTo(0.4, 12) });
  });

  it('keeps the KS point in the table of a few points', () => {
    const rows = ksTable(points, 550, 2);
    expect(rows.map((row) => row.score)).toEqual([400, 550, 700]);
    expect(rows.find((row) => row.isKs)?.score).toBe(550);
  });
});

describe('bootstrap histograms', () => {
  const histogram = { edges: [-0.01, 0, 0.01, 0.02, 0.03], counts: [5, 20, 60, 15] };

  it('marks the bins that lie wholly inside the interval', () => {
    const bins = histogramBins(histogram, [0, 0.02]);
    expect(bins.map((bin) => bin.inside)).toEqual([false, true, true, false]);
    expect(histogramBins(histogram, null).every((bin) => !bin.inside)).toBe(true);
    expect(bins[2]).toMatchObject({ from: 0.01, to: 0.02, count: 60 });
  });

  it('places values along the whole range and counts the replicates', () => {
    expect(positionInHistogram(histogram, -0.01)).toBe(0);
    expect(positionInHistogram(histogram, 0.01)).toBeCloseTo(0.5, 12);
    expect(positionInHistogram(histogram, 1)).toBe(1);
    expect(histogramTotal(histogram)).toBe(100);
  });
});

describe('thinning a curve', () => {
  it('keeps the first and last points and at most the number asked', () => {
    const points = Array.from({ length: 101 }, (_, index) => index);
    const kept = thin(points, 11);
    expect(kept).toEqual([0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100]);
    expect(thin([1, 2, 3], 10)).toEqual([1, 2, 3]);
  });
});
