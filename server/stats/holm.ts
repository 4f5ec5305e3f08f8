/**
 * Holm's step-down adjustment of p-values for multiple tests (Holm 1979, "A simple sequentially
 * rejective multiple test procedure", Scandinavian Journal of Statistics 6:65–70): with the m
 * p-values sorted ascending, p_(i) becomes max over j ≤ i of min(1, (m − j + 1)·p_(j)). Controls
 * the family-wise error rate without assumptions on dependence. Null entries (tests that could
 * not be run) stay null and do not count in m. Ties keep their input order. Cost: O(m log m).
 */
export function holm(pValues: readonly (number | null)[]): (number | null)[] {
  const tested = pValues.flatMap((p, index) => (p === null ? [] : [{ p, index }]));
  tested.sort((a, b) => a.p - b.p || a.index - b.index);
  const m = tested.length;
  const adjusted: (number | null)[] = pValues.map(() => null);
  let running = 0;
  tested.forEach(({ p, index }, i) => {
    running = Math.max(running, Math.min(1, (m - i) * p));
    adjusted[index] = running;
  });
  return adjusted;
}
