import { useEffect, useRef } from 'react';
import { useSearchParams } from 'react-router';
import { paths } from '@/config/paths';
import { cn } from '@/lib/cn';

/**
 * The committee pack's downloads as ordinary links (the browser sends the session cookie): the
 * PDF made by the server (once decided, the one archived with the decision) and the workbook.
 * The committee's e-mail links to the report page with `?pack=pdf` (server/pack/links.ts): then
 * the PDF's link is shown first, marked as the one from the e-mail, and has the focus.
 */
export function PackDownloads({ comparisonId, decided, className }: { comparisonId: number; decided: boolean; className?: string }) {
  const [search] = useSearchParams();
  const fromMail = search.get('pack') === 'pdf';
  const pdfLink = useRef<HTMLAnchorElement>(null);
  useEffect(() => {
    if (fromMail) pdfLink.current?.focus();
  }, [fromMail]);
  const link =
    'inline-flex min-h-8 items-center gap-1.5 rounded-md border border-line-strong bg-paper-raised px-2.5 text-sm font-medium text-ink hover:bg-paper-sunk focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-court-500';
  const primary =
    'inline-flex min-h-8 items-center gap-1.5 rounded-md border border-court-700 bg-court-700 px-2.5 text-sm font-medium text-white hover:bg-court-800 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-court-500';
  return (
    <div className={cn('flex flex-wrap items-center gap-2 print:hidden', className)} data-print="hide">
      <span className="text-sm text-ink-soft">{fromMail ? 'The committee pack from your e-mail:' : 'Committee pack:'}</span>
      <a ref={pdfLink} className={fromMail ? primary : link} href={paths.exports.packPdf(comparisonId)} download>
        {decided ? 'PDF as decided' : 'PDF'}
      </a>
      <a className={link} href={paths.exports.workbook(comparisonId)} download>
        Workbook (.xlsx)
      </a>
    </div>
  );
}
