import { describe, expect, it } from 'vitest';
import { matchPath } from 'react-router';
import { paths, safeReturnPath } from '@/config/paths';

describe('paths', () => {
  it('builds comparison URLs that match their own router patterns', () => {
    const pages = ['detail', 'curves', 'swapSets', 'segments', 'bands', 'data', 'review', 'report'] as const;
    for (const page of pages) {
      const url = paths.comparisons[page](42);
      expect(matchPath(paths.comparisons[page].pattern, url)?.params.id).toBe('42');
    }
    expect(paths.comparisons.detail(42)).toBe('/comparisons/42');
    expect(paths.comparisons.swapSets(42)).toBe('/comparisons/42/swap-sets');
    expect(paths.comparisons.new()).toBe('/comparisons/new');
    expect(paths.comparisons.setup(42)).toBe('/comparisons/42/setup');
    expect(matchPath(paths.comparisons.setup.pattern, paths.comparisons.setup(42))?.params.id).toBe('42');
  });

  it('keeps the list filters in the URL, leaving out page 1 and the default sort', () => {
    expect(paths.comparisons.list({ sort: 'updated-desc', page: 1 })).toBe('/comparisons');
    expect(paths.comparisons.list({ state: 'analysed', q: 'cash flow', sort: 'name-asc', page: 3 })).toBe('/comparisons?state=analysed&q=cash+flow&sort=name-asc&page=3');
  });

  it('builds the download links of a comparison', () => {
    expect(paths.exports.bandsCsv(7)).toBe('/api/comparisons/7/export/bands.csv');
    expect(paths.exports.reportJson(7)).toBe('/api/comparisons/7/export/report.json');
    expect(paths.exports.swapCsv(7, { approvalRate: 0.65 })).toBe('/api/comparisons/7/export/swap.csv?approvalRate=0.65');
    expect(paths.exports.swapCsv(7, { cutoffs: { champion: 600, challenger: -1.5 } })).toBe(
      '/api/comparisons/7/export/swap.csv?championCutoff=600&challengerCutoff=-1.5',
    );
  });

  it('encodes path segments', () => {
    expect(paths.auth.accept('a/b c')).toBe('/accept/a%2Fb%20c');
    expect(matchPath(paths.auth.accept.pattern, paths.auth.accept('tok_en-1'))?.params.token).toBe('tok_en-1');
  });

  it('adds only the query parameters that are set', () => {
    expect(paths.comparisons.list()).toBe('/comparisons');
    expect(paths.comparisons.list({ state: 'in-review', q: '' })).toBe('/comparisons?state=in-review');
    expect(paths.admin.outbox({ page: 1 })).toBe('/admin/outbox');
    expect(paths.admin.outbox({ page: 3 })).toBe('/admin/outbox?page=3');
    expect(paths.auth.signIn({ next: '/admin/people?x=1' })).toBe('/sign-in?next=%2Fadmin%2Fpeople%3Fx%3D1');
  });

  it('follows only return paths on this site', () => {
    expect(safeReturnPath('/admin/people')).toBe('/admin/people');
    expect(safeReturnPath('//evil.example/x')).toBeNull();
    expect(safeReturnPath('/\\evil.example')).toBeNull();
    expect(safeReturnPath('https://evil.example')).toBeNull();
    expect(safeReturnPath('')).toBeNull();
    expect(safeReturnPath(null)).toBeNull();
    expect(paths.auth.signIn({ next: 'https://evil.example' })).toBe('/sign-in');
  });
});
