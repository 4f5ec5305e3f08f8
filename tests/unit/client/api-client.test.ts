import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, CSRF_HEADER, api, buildUrl, errorMessage, resetCsrfToken, upload } from '@/lib/api-client';

// The API contract these tests hold the client to: shared/users.ts (paths) and shared/errors.ts
// (the one error shape). fetch and XMLHttpRequest are replaced by recorders; no server runs.

interface Call {
  url: string;
  init: RequestInit;
}

function json(status: number, body: unknown, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json', ...headers } });
}

function errorBody(code: string, message: string, details?: unknown) {
  return { error: { code, message, ...(details === undefined ? {} : { details }) } };
}

/** A fetch that answers from a queue of handlers and records every call. */
function mockFetch(handler: (call: Call, index: number) => Response | Promise<Response>) {
  const calls: Call[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const call = { url: String(input), init };
    calls.push(call);
    return handler(call, calls.length - 1);
  });
  vi.stubGlobal('fetch', fetchMock);
  return calls;
}

function header(call: Call, name: string): string | undefined {
  const headers = call.init.headers as Record<string, string> | undefined;
  return headers?.[name];
}

beforeEach(() => resetCsrfToken());
afterEach(() => vi.unstubAllGlobals());

describe('requests', () => {
  it('sends GETs with the session cookie, no CSRF token, and returns the JSON body', async () => {
    const calls = mockFetch(() => json(200, { ok: true }));
    await expect(api.get('/api/health')).resolves.toEqual({ ok: true });
    expect(calls).toHaveLength(1);
    expect(calls[0].url).toBe('/api/health');
    expect(calls[0].init.credentials).toBe('same-origin');
    expect(calls[0].init.method).toBe('GET');
    expect(header(calls[0], CSRF_HEADER)).toBeUndefined();
  });

  it('builds query strings and leaves out empty parameters', async () => {
    expect(buildUrl('/api/outbox', { page: 2, pageSize: 25, q: undefined, state: null })).toBe('/api/outbox?page=2&pageSize=25');
    expect(buildUrl('/api/users')).toBe('/api/users');
    const calls = mockFetch(() => json(200, { messages: [], total: 0 }));
    await api.get('/api/outbox', { query: { page: 1 } });
    expect(calls[0].url).toBe('/api/outbox?page=1');
  });

  it('validates the response body with the given schema', async () => {
    mockFetch(() => json(200, { user: { id: 'not a number' } }));
    const schema = z.object({ user: z.object({ id: z.number() }) });
    const error = await api.get('/api/auth/me', { schema }).catch((caught: unknown) => caught);
    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).code).toBe('bad_response');
  });

  it('returns undefined for 204 No Content', async () => {
    mockFetch((call) => (call.url === '/api/auth/csrf' ? json(200, { token: 't' }) : new Response(null, { status: 204 })));
    await expect(api.post('/api/auth/logout')).resolves.toBeUndefined();
  });
});

describe('CSRF token', () => {
  it('fetches the token once, then sends it as X-CSRF-Token on every mutation', async () => {
    const calls = mockFetch((call) => (call.url === '/api/auth/csrf' ? json(200, { token: 'token-1' }) : json(200, { ok: true })));
    await api.post('/api/auth/login', { email: 'a@tallowmere.test', password: 'x' });
    await api.patch('/api/users/3', { active: false });
    await api.delete('/api/things/1');

    expect(calls.map((call) => call.url)).toEqual(['/api/auth/csrf', '/api/auth/login', '/api/users/3', '/api/things/1']);
    for (const call of calls.slice(1)) expect(header(call, CSRF_HEADER)).toBe('token-1');
    expect(calls[1].init.body).toBe(JSON.stringify({ email: 'a@tallowmere.test', password: 'x' }));
    expect(header(calls[1], 'Content-Type')).toBe('application/json');
  });

  it('refetches the token and retries once after a 403 csrf_invalid', async () => {
    let tokens = 0;
    const calls = mockFetch((call) => {
      if (call.url === '/api/auth/csrf') return json(200, { token: `token-${++tokens}` });
      if (header(call, CSRF_HEADER) === 'token-1') return json(403, errorBody('csrf_invalid', 'Invalid CSRF token'));
      return json(201, { user: { id: 1 } });
    });
    await expect(api.post('/api/users/invitations', { email: 'x' })).resolves.toEqual({ user: { id: 1 } });
    expect(calls.map((call) => `${call.url} ${header(call, CSRF_HEADER) ?? ''}`.trim())).toEqual([
      '/api/auth/csrf',
      '/api/users/invitations token-1',
      '/api/auth/csrf',
      '/api/users/invitations token-2',
    ]);
  });

  it('gives up after one retry and reports the refusal', async () => {
    const calls = mockFetch((call) =>
      call.url === '/api/auth/csrf' ? json(200, { token: 'stale' }) : json(403, errorBody('csrf_invalid', 'Invalid CSRF token')),
    );
    const error = await api.post('/api/auth/logout').catch((caught: unknown) => caught);
    expect(error).toMatchObject({ status: 403, code: 'csrf_invalid' });
    expect(calls.filter((call) => call.url !== '/api/auth/csrf')).toHaveLength(2);
  });

  it('does not retry other 403s', async () => {
    const calls = mockFetch((call) =>
      call.url === '/api/auth/csrf' ? json(200, { token: 't' }) : json(403, errorBody('forbidden', 'Administrators only')),
    );
    await expect(api.patch('/api/users/1', { active: false })).rejects.toMatchObject({ status: 403, code: 'forbidden' });
    expect(calls).toHaveLength(2);
  });

  it('fetches a new token after resetCsrfToken (a new session)', async () => {
    let tokens = 0;
    const calls = mockFetch((call) => (call.url === '/api/auth/csrf' ? json(200, { token: `t${++tokens}` }) : json(200, {})));
    await api.post('/api/auth/login', {});
    resetCsrfToken();
    await api.post('/api/auth/logout');
    expect(calls.filter((call) => call.url === '/api/auth/csrf')).toHaveLength(2);
    expect(header(calls[3], CSRF_HEADER)).toBe('t2');
  });
});

describe('errors', () => {
  it('parses the one error shape into an ApiError with status, code, message and details', async () => {
    mockFetch((call) =>
      call.url === '/api/auth/csrf'
        ? json(200, { token: 't' })
        : json(400, errorBody('validation_failed', 'Check the highlighted fields', [{ path: ['email'], message: 'Enter a valid e-mail address' }])),
    );
    const error = (await api.post('/api/users/invitations', {}).catch((caught: unknown) => caught)) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(400);
    expect(error.code).toBe('validation_failed');
    expect(error.message).toBe('Check the highlighted fields');
    expect(error.details).toEqual([{ path: ['email'], message: 'Enter a valid e-mail address' }]);
    expect(errorMessage(error)).toBe('Check the highlighted fields');
  });

  it('reads Retry-After on a rate-limited answer', async () => {
    mockFetch((call) =>
      call.url === '/api/auth/csrf'
        ? json(200, { token: 't' })
        : json(429, errorBody('rate_limited', 'Too many sign-in attempts'), { 'Retry-After': '900' }),
    );
    await expect(api.post('/api/auth/login', {})).rejects.toMatchObject({ status: 429, code: 'rate_limited', retryAfter: 900 });
  });

  it('turns an answer that is not the error shape into a readable ApiError', async () => {
    mockFetch(() => new Response('<html>Bad gateway</html>', { status: 502, statusText: 'Bad Gateway', headers: { 'Content-Type': 'text/html' } }));
    const error = (await api.get('/api/users').catch((caught: unknown) => caught)) as ApiError;
    expect(error.status).toBe(502);
    expect(error.code).toBe('internal_error');
    expect(error.message).toContain('502');
  });

  it('reports an unreachable server as status 0, network_error', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => Promise.reject(new TypeError('fetch failed'))));
    await expect(api.get('/api/auth/me')).rejects.toMatchObject({ status: 0, code: 'network_error' });
  });

  it('does not cache a failed CSRF fetch', async () => {
    let csrfCalls = 0;
    mockFetch((call) => {
      if (call.url === '/api/auth/csrf') return ++csrfCalls === 1 ? json(500, errorBody('internal_error', 'Boom')) : json(200, { token: 'ok' });
      return json(200, { done: true });
    });
    await expect(api.post('/api/x')).rejects.toMatchObject({ status: 500 });
    await expect(api.post('/api/x')).resolves.toEqual({ done: true });
    expect(csrfCalls).toBe(2);
  });
});

// --- uploads: a minimal XMLHttpRequest double with the parts upload() uses ------------------

class FakeXhr {
  static instances: FakeXhr[] = [];
  static respond: (xhr: FakeXhr) => { status: number; body: unknown };
  method = '';
  url = '';
  headers: Record<string, string> = {};
  status = 0;
  statusText = '';
  responseText = '';
  sent: unknown = null;
  upload: { onprogress: ((event: { loaded: number; total: number; lengthComputable: boolean }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  constructor() {
    FakeXhr.instances.push(this);
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name] = value;
  }
  getResponseHeader(name: string) {
    return name.toLowerCase() === 'content-type' ? 'application/json' : null;
  }
  abort() {
    queueMicrotask(() => this.onabort?.());
  }
  send(body: unknown) {
    this.sent = body;
    queueMicrotask(() => {
      this.upload.onprogress?.({ loaded: 50, total: 200, lengthComputable: true });
      this.upload.onprogress?.({ loaded: 200, total: 200, lengthComputable: true });
      const { status, body: responseBody } = FakeXhr.respond(this);
      this.status = status;
      this.responseText = JSON.stringify(responseBody);
      this.onload?.();
    });
  }
}

describe('upload', () => {
  beforeEach(() => {
    FakeXhr.instances = [];
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
  });

  it('reports progress, sends the CSRF token and resolves with the JSON body', async () => {
    mockFetch(() => json(200, { token: 'up-1' }));
    FakeXhr.respond = () => ({ status: 201, body: { id: 7 } });
    const form = new FormData();
    form.append('file', new Blob(['a,b\n1,2\n']), 'holdout.csv');
    const progress: Array<number | null> = [];

    const result = await upload('/api/uploads', form, { onProgress: (event) => progress.push(event.fraction) });

    expect(result).toEqual({ id: 7 });
    expect(progress).toEqual([0.25, 1]);
    expect(FakeXhr.instances[0].method).toBe('POST');
    expect(FakeXhr.instances[0].headers[CSRF_HEADER]).toBe('up-1');
    expect(FakeXhr.instances[0].sent).toBe(form);
  });

  it('parses API errors from an upload', async () => {
    mockFetch(() => json(200, { token: 't' }));
    FakeXhr.respond = () => ({ status: 413, body: errorBody('payload_too_large', 'The file is larger than 2 GB') });
    await expect(upload('/api/uploads', new FormData())).rejects.toMatchObject({ status: 413, code: 'payload_too_large' });
  });

  it('retries once with a fresh token after csrf_invalid', async () => {
    let tokens = 0;
    mockFetch(() => json(200, { token: `t${++tokens}` }));
    FakeXhr.respond = (xhr) =>
      xhr.headers[CSRF_HEADER] === 't1' ? { status: 403, body: errorBody('csrf_invalid', 'Invalid CSRF token') } : { status: 200, body: { ok: 1 } };
    await expect(upload('/api/uploads', new FormData())).resolves.toEqual({ ok: 1 });
    expect(FakeXhr.instances.map((xhr) => xhr.headers[CSRF_HEADER])).toEqual(['t1', 't2']);
  });

  it('rejects with code aborted when cancelled', async () => {
    mockFetch(() => json(200, { token: 't' }));
    FakeXhr.respond = () => ({ status: 200, body: {} });
    const controller = new AbortController();
    controller.abort();
    await expect(upload('/api/uploads', new FormData(), { signal: controller.signal })).rejects.toMatchObject({ code: 'aborted' });
  });
});
