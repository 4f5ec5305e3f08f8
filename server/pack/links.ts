import { comparisonLink } from '../governance/links';

/**
 * The committee pack's PDF as a link for e-mails: the report page with `?pack=pdf`, where the PDF's
 * download link is shown first (src/features/comparisons/components/pack-downloads.tsx). A page
 * rather than the API route, so a reader who is signed out is asked to sign in and then comes back
 * to it, instead of seeing the API's 401 answer.
 */
export const packQuery = 'pack=pdf';

export function packLink(publicUrl: string, id: number): string {
  return `${comparisonLink(publicUrl, id, 'report')}?${packQuery}`;
}
