import { type SwapQuery } from '@shared/comparisons';
import { paths } from '@/config/paths';
import { buttonClasses } from '@/components/button';

/**
 * Downloads as plain links (the browser sends the session cookie): the band tables and the
 * report for everyone, the swap-in and swap-out accounts at these settings for the policy role.
 */
export function ExportLinks({ comparisonId, query, canExportSwapList }: { comparisonId: number; query: SwapQuery; canExportSwapList: boolean }) {
  const swapAt = query.cutoffs ? { cutoffs: query.cutoffs } : { approvalRate: query.approvalRate ?? 0.7 };
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-2">
        {canExportSwapList ? (
          <a href={paths.exports.swapCsv(comparisonId, swapAt)} download className={buttonClasses({ size: 'sm', variant: 'primary' })}>
            Swap list at these settings (swap.csv)
          </a>
        ) : null}
        <a href={paths.exports.bandsCsv(comparisonId)} download className={buttonClasses({ size: 'sm' })}>
          Band tables (bands.csv)
        </a>
        <a href={paths.exports.reportJson(comparisonId)} download className={buttonClasses({ size: 'sm' })}>
          Full report (report.json)
        </a>
      </div>
      <p className="text-xs text-ink-soft">
        {canExportSwapList
          ? 'The swap list holds the swap-in and swap-out accounts: id, both scores, outcome and amount. Handle it as personal data.'
          : 'The list of swap-in and swap-out accounts is exported by the credit policy role.'}
      </p>
    </div>
  );
}
