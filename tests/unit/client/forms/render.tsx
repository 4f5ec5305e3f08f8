import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, type RenderResult } from '@testing-library/react';
import { type ReactElement } from 'react';
import { afterEach, beforeEach, vi } from 'vitest';
import { type Governance } from '@shared/governance';
import { resetCsrfToken } from '@/lib/api-client';

/**
 * What the form tests share: a fresh query client per render (no retries, so an error shows at
 * once), and a fake `fetch` that answers the API's paths and records every request the form
 * sends, as the server would see it (method, path, CSRF header, JSON body).
 */

export interface SentRequest {
  method: string;
  path: string;
  csrf: string | null;
  body: unknown;
}

export type Answer = { status: number; body: unknown };
type Route = (body: unknown) => Answer;

export const CSRF_TOKEN = 'token-for-the-form-tests';

/** Installs the fake API for each test of the file; `routes` maps "POST /api/…" to an answer. */
export function useFakeApi(): { sent: SentRequest[]; answer: (key: string, route: Route) => void } {
  const sent: SentRequest[] = [];
  const routes = new Map<string, Route>();
  beforeEach(() => {
    sent.length = 0;
    routes.clear();
    resetCsrfToken();
    routes.set('GET /api/auth/csrf', () => ({ status: 200, body: { token: CSRF_TOKEN } }));
    vi.stubGlobal('fetch', async (input: string, init: RequestInit = {}) => {
      const method = init.method ?? 'GET';
      const path = String(input);
      const headers = new Headers(init.headers);
      const body = typeof init.body === 'string' ? (JSON.parse(init.body) as unknown) : undefined;
      if (path !== '/api/auth/csrf') sent.push({ method, path, csrf: headers.get('X-CSRF-Token'), body });
      const route = routes.get(`${method} ${path}`);
      const { status, body: reply } = route ? route(body) : { status: 404, body: { error: { code: 'not_found', message: `No fake answer for ${method} ${path}.` } } };
      return new Response(JSON.stringify(reply), { status, headers: { 'Content-Type': 'application/json' } });
    });
  });
  afterEach(() => {
    vi.unstubAllGlobals();
  });
  return { sent, answer: (key, route) => routes.set(key, route) };
}

// Unmounting after each test and the bound on waiting for the page are set per file, in
// tests/setup/dom-tests.ts (a module's own top-level hooks run once per worker: modules are kept
// across files).

export function renderWithQueries(ui: ReactElement): RenderResult & { queryClient: QueryClient } {
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  return { ...render(<QueryClientProvider client={queryClient}>{ui}</QueryClientProvider>), queryClient };
}

const person = (id: number, name: string) => ({ id, name });

/** A governance answer as the server gives it after a step (shared/governance.ts's schema). */
export function governanceAnswer(overrides: Partial<Governance> = {}): Governance {
  return {
    state: 'validated',
    createdBy: person(1, 'Ada Moreno'),
    reviews: [],
    votes: [],
    decision: null,
    verdicts: [],
    quorum: 2,
    policyVersion: 1,
    tally: { adopt: 0, keep: 0, defer: 0 },
    majority: null,
    adoptVotesByChallenger: [0],
    authors: [person(1, 'Ada Moreno')],
    ...overrides,
  };
}

/** The API's one error shape (shared/errors.ts). */
export function apiError(status: number, code: string, message: string, details?: unknown): Answer {
  return { status, body: { error: { code, message, ...(details === undefined ? {} : { details }) } } };
}
