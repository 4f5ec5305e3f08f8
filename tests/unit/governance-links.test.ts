import { describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { comparisonLink } from '@server/governance/links';
import { packLink } from '@server/pack/links';

/** The e-mails' links (server) must open the client's pages (src/config/paths.ts). */
describe('comparison links in e-mails', () => {
  it('match the client paths of the verdict, review and report pages', () => {
    const base = 'https://scorecourt.example.test';
    expect(comparisonLink(base, 42)).toBe(`${base}${paths.comparisons.detail(42)}`);
    expect(comparisonLink(base, 42, 'review')).toBe(`${base}${paths.comparisons.review(42)}`);
    expect(comparisonLink(`${base}/`, 42, 'report')).toBe(`${base}${paths.comparisons.report(42)}`);
  });

  it('send the committee pack as the report page that offers the PDF first, never as the API route', () => {
    const base = 'https://scorecourt.example.test';
    expect(packLink(base, 42)).toBe(`${base}${paths.comparisons.report(42)}?pack=pdf`);
    expect(packLink(base, 42)).not.toContain('/api/');
  });
});
