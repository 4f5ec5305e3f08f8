import { paths } from '@/config/paths';
import { cn } from '@/lib/cn';

/**
 * The committee pack's downloads as ordinary links (the browser sends the session cookie): the
 * PDF made by the server (once decided, the one archived with the decision) and the workbook.
 */
export function PackDownloads({ comparisonId, decided, className }: { comparisonId: number; decided: boolean; className?: string }) {
  const link =
    'inline-flex min-h-8 items-center gap-1.5 rounded-md border border-line-strong bg-paper-raised px-2.5 text-sm font-medium text-ink hover:bg-paper-sunk focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-court-500';
  return (
    <div className={cn('flex flex-wrap items-center gap-2 print:hidden', className)} data-print="hide">
      <span className="text-sm text-ink-soft">Committee pack:</span>
      <a className={link} href={paths.exports.packPdf(comparisonId)} download>
        {decided ? 'PDF as decided' : 'PDF'}
      </a>
      <a className={link} href={paths.exports.workbook(comparisonId)} download>
        Workbook (.xlsx)
      </a>
    </div>
  );
}
