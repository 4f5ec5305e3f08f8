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
