/**
 * Links to the web app's pages in e-mails. The server cannot import the client, so the patterns
 * of src/config/paths.ts (`/comparisons/:id`, `/comparisons/:id/review`, `/comparisons/:id/report`)
 * are repeated here; tests/unit/governance-links.test.ts checks that the two agree.
 */
export type ComparisonPage = 'verdict' | 'review' | 'report';

export function comparisonLink(publicUrl: string, id: number, page: ComparisonPage = 'verdict'): string {
  const base = `${publicUrl.replace(/\/+$/, '')}/comparisons/${encodeURIComponent(String(id))}`;
  return page === 'verdict' ? base : `${base}/${page}`;
}
