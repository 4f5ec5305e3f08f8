/**
 * Every client URL, built here and nowhere else. Each entry is a function that builds the URL
 * (`paths.comparisons.detail(12)` → "/comparisons/12") and carries the router pattern it matches
 * (`paths.comparisons.detail.pattern` → "/comparisons/:id"), so routes and links cannot drift.
 *
 * The comparison pages are listed ahead of their screens so later work only adds the routes.
 * The server builds the one-time link in e-mails as `/accept/:token` (paths.auth.accept).
 */

type Id = number | string;

type Path<Args extends unknown[]> = ((...args: Args) => string) & { readonly pattern: string };

function path<Args extends unknown[]>(pattern: string, build: (...args: Args) => string): Path<Args> {
  return Object.assign(build, { pattern });
}

function fixed(pattern: string): Path<[]> {
  return path(pattern, () => pattern);
}

const segment = (value: Id) => encodeURIComponent(String(value));

/**
 * A return path is only followed when it is a path on this site: it starts with one "/" and is
 * not a protocol-relative "//host" or "/\host" (which browsers treat as another site).
 */
export function safeReturnPath(value: string | null | undefined): string | null {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null;
  return value;
}

function withQuery(base: string, query: Record<string, string | number | null | undefined>): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) if (value !== null && value !== undefined && value !== '') params.set(key, String(value));
  const text = params.toString();
  return text ? `${base}?${text}` : base;
}

const comparison = (suffix: string) =>
  path(`/comparisons/:id${suffix}`, (id: Id) => `/comparisons/${segment(id)}${suffix}`);

export const paths = {
  home: fixed('/'),

  auth: {
    /**
     * Sign-in, with the page to return to afterwards, and why the person is here: `signed-out`
     * (they chose to) or `expired` (their session ended while a page was open).
     */
    signIn: path('/sign-in', (options: { next?: string | null; reason?: 'signed-out' | 'expired' } = {}) =>
      withQuery('/sign-in', { next: safeReturnPath(options.next), reason: options.reason }),
    ),
    forgotPassword: fixed('/forgot-password'),
    /** The one-time link of an invitation or password reset. */
    accept: path('/accept/:token', (token: string) => `/accept/${segment(token)}`),
  },

  comparisons: {
    /** The list with its filters; page 1 and the default sort are left out of the URL. */
    list: path('/comparisons', (filters: { state?: string; q?: string; page?: number; sort?: string } = {}) =>
      withQuery('/comparisons', {
        state: filters.state,
        q: filters.q,
        sort: filters.sort && filters.sort !== 'updated-desc' ? filters.sort : null,
        page: filters.page && filters.page > 1 ? filters.page : null,
      }),
    ),
    new: fixed('/comparisons/new'),
    /** The wizard's later steps for a comparison: column mapping, validation, settings, run. */
    setup: comparison('/setup'),
    /** The verdict is a comparison's front page. */
    detail: comparison(''),
    curves: comparison('/curves'),
    swapSets: comparison('/swap-sets'),
    segments: comparison('/segments'),
    bands: comparison('/bands'),
    calibration: comparison('/calibration'),
    stability: comparison('/stability'),
    data: comparison('/data'),
    review: comparison('/review'),
    report: comparison('/report'),
  },

  /**
   * Downloads served by the API, used as plain links (the session cookie goes with them): the band
   * tables, the swap-in and swap-out accounts at given cut-offs or approval rate (policy role), the
   * report as JSON, and the evidence pack.
   */
  exports: {
    bandsCsv: path('/api/comparisons/:id/export/bands.csv', (id: Id, challenger?: number) =>
      // Several challengers: whose band table goes beside the champion's (absent = the first).
      challenger ? withQuery(`/api/comparisons/${segment(id)}/export/bands.csv`, { challenger }) : `/api/comparisons/${segment(id)}/export/bands.csv`,
    ),
    swapCsv: path(
      '/api/comparisons/:id/export/swap.csv',
      (id: Id, at: { cutoffs: { champion: number; challenger: number } } | { approvalRate: number }, challenger?: number) =>
        withQuery(`/api/comparisons/${segment(id)}/export/swap.csv`, {
          ...('cutoffs' in at ? { championCutoff: at.cutoffs.champion, challengerCutoff: at.cutoffs.challenger } : { approvalRate: at.approvalRate }),
          // Several challengers: which one is set against the champion (absent = the first).
          challenger: challenger ? challenger : undefined,
        }),
    ),
    reportJson: path('/api/comparisons/:id/export/report.json', (id: Id) => `/api/comparisons/${segment(id)}/export/report.json`),
    packPdf: path('/api/comparisons/:id/export/pack.pdf', (id: Id) => `/api/comparisons/${segment(id)}/export/pack.pdf`),
    workbook: path('/api/comparisons/:id/export/workbook.xlsx', (id: Id) => `/api/comparisons/${segment(id)}/export/workbook.xlsx`),
    /** The evidence pack: report, settings, hashes, verdict records, reviews, votes, decision, notes and audit trail. */
    evidenceJson: path('/api/comparisons/:id/evidence.json', (id: Id) => `/api/comparisons/${segment(id)}/evidence.json`),
  },

  admin: {
    people: fixed('/admin/people'),
    policy: fixed('/admin/policy'),
    outbox: path('/admin/outbox', (options: { page?: number } = {}) =>
      withQuery('/admin/outbox', { page: options.page && options.page > 1 ? options.page : null }),
    ),
  },

  /** Development only (`npm run dev`): the shared components in their states. */
  dev: {
    components: fixed('/dev/components'),
  },
} as const;
