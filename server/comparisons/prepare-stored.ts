import type { AnalysisSettings, ColumnMapping, SwapMatrix } from '@shared/report';
import type { RunInput } from '../db/entities/index';
import { decodeHoldout, decodeOrders } from '../holdouts/columns';
import { preparePolicyData, type PreparedHoldout } from '../stats/policy-data';
import { swapMatrix } from '../stats/swap-matrix';

/**
 * A done run's stored columns (without the ids) prepared for swap sets: decoded, run through
 * preparePolicyData with the stored sort orders (no sort), and the swap matrix. Shared by
 * comparisons/prepared-cache.ts (on this thread) and jobs/prepare-worker.ts (on a worker), so it
 * imports neither the cache nor anything that starts workers.
 */
export function prepareStored(
  input: RunInput,
  mapping: ColumnMapping,
  settings: Pick<AnalysisSettings, 'bands' | 'rejectInference'>,
  columns: ReadonlyMap<string, Uint8Array>,
): { data: PreparedHoldout; matrix: SwapMatrix } {
  const holdout = decodeHoldout({ ...input, hasIds: false }, mapping, columns);
  const orders = decodeOrders(input.n, columns);
  const data = preparePolicyData(holdout, { bands: settings.bands, orders: orders ?? undefined, inference: settings.rejectInference });
  return { data, matrix: swapMatrix(data) };
}
