/**
 * A small API client for browser tests that set up their data through the API first (signing in,
 * uploads, comparisons): keeps the session cookie and sends the CSRF token like the web client.
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';

export class ApiSession {
  private cookie = '';
  private csrf = '';

  constructor(private readonly baseUrl: string) {}

  private remember(response: Response): void {
    const setCookie = response.headers.getSetCookie?.() ?? [];
    for (const value of setCookie) if (value.startsWith('scorecourt.sid=')) this.cookie = value.split(';')[0];
    const token = response.headers.get('x-csrf-token');
    if (token) this.csrf = token;
  }

  async request<T = unknown>(method: string, url: string, body?: unknown): Promise<{ status: number; body: T }> {
    if (!this.csrf && method !== 'GET') {
      const response = await fetch(`${this.baseUrl}/api/auth/csrf`, { headers: { Cookie: this.cookie } });
      this.remember(response);
      this.csrf = ((await response.json()) as { token: string }).token;
    }
    const headers: Record<string, string> = { Cookie: this.cookie, Accept: 'application/json' };
    if (method !== 'GET') headers['X-CSRF-Token'] = this.csrf;
    let payload: BodyInit | undefined;
    if (body instanceof FormData) payload = body;
    else if (body !== undefined) {
      headers['Content-Type'] = 'application/json';
      payload = JSON.stringify(body);
    }
    const response = await fetch(`${this.baseUrl}${url}`, { method, headers, body: payload });
    this.remember(response);
    const text = await response.text();
    return { status: response.status, body: (text ? JSON.parse(text) : undefined) as T };
  }

  async signIn(email: string, password = 'scorecourt-demo'): Promise<void> {
    const response = await this.request('POST', '/api/auth/login', { email, password });
    if (response.status !== 200) throw new Error(`sign-in as ${email} failed: ${response.status}`);
  }

  async upload(file: string): Promise<number> {
    const form = new FormData();
    form.append('file', new Blob([await readFile(file)], { type: 'text/csv' }), path.basename(file));
    const response = await this.request<{ id: number }>('POST', '/api/holdouts', form);
    if (response.status !== 201) throw new Error(`upload failed: ${response.status} ${JSON.stringify(response.body)}`);
    return response.body.id;
  }

  /** Polls the comparison until its newest run is done (or fails). */
  async waitForAnalysis(id: number, timeoutMs = 60_000): Promise<string> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const { body } = await this.request<{ state: string; latestRun: { status: string } | null }>('GET', `/api/comparisons/${id}`);
      if (body.latestRun?.status === 'done' || body.latestRun?.status === 'failed') return body.state;
      if (Date.now() > deadline) throw new Error(`comparison ${id} was not analysed within ${timeoutMs} ms`);
      await new Promise((resolve) => setTimeout(resolve, 200));
    }
  }
}
