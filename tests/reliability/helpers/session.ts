/**
 * A signed-in client of a running server, like the web client: keeps the session cookie, sends
 * the CSRF token on mutations and follows its renewal. Besides JSON calls it streams a multipart
 * upload from disk at a chosen pace (to be killed in the middle), over plain node:http.
 */
import { createReadStream, statSync } from 'node:fs';
import http from 'node:http';
import path from 'node:path';

export class Session {
  cookie = '';
  csrf = '';

  constructor(readonly baseUrl: string) {}

  private remember(headers: Headers | http.IncomingHttpHeaders): void {
    const setCookie = headers instanceof Headers ? headers.getSetCookie() : ((headers['set-cookie'] as string[] | undefined) ?? []);
    for (const value of setCookie) if (value.startsWith('scorecourt.sid=')) this.cookie = value.split(';')[0];
    const token = headers instanceof Headers ? headers.get('x-csrf-token') : (headers['x-csrf-token'] as string | undefined);
    if (token) this.csrf = token;
  }

  async token(): Promise<string> {
    if (!this.csrf) {
      const response = await fetch(`${this.baseUrl}/api/auth/csrf`, { headers: { Cookie: this.cookie } });
      this.remember(response.headers);
      this.csrf = ((await response.json()) as { token: string }).token;
    }
    return this.csrf;
  }

  /** A JSON call (or a FormData upload); the body is parsed when it is JSON. */
  async request<T = Record<string, unknown>>(method: string, url: string, body?: unknown, headers: Record<string, string> = {}): Promise<{ status: number; body: T; text: string; headers: Headers }> {
    const token = method !== 'GET' && method !== 'HEAD' ? await this.token() : null;
    const sent: Record<string, string> = { Cookie: this.cookie, Accept: 'application/json', ...headers };
    if (token !== null) sent['X-CSRF-Token'] = token;
    let payload: BodyInit | undefined;
    if (body instanceof FormData || typeof body === 'string') payload = body;
    else if (body !== undefined) {
      sent['Content-Type'] = 'application/json';
      payload = JSON.stringify(body);
    }
    const response = await fetch(`${this.baseUrl}${url}`, { method, headers: sent, body: payload });
    this.remember(response.headers);
    const text = await response.text();
    let parsed: unknown = undefined;
    if ((response.headers.get('content-type') ?? '').includes('json') && text) parsed = JSON.parse(text);
    return { status: response.status, body: parsed as T, text, headers: response.headers };
  }

  async signIn(email: string, password = 'scorecourt-demo'): Promise<this> {
    const response = await this.request('POST', '/api/auth/login', { email, password });
    if (response.status !== 200) throw new Error(`sign-in as ${email} failed: ${response.status} ${response.text}`);
    return this;
  }

  async upload(bytes: Uint8Array, fileName = 'holdout.csv'): Promise<{ status: number; body: Record<string, unknown> & { id?: number } }> {
    const form = new FormData();
    form.append('file', new Blob([new Uint8Array(bytes)], { type: 'text/csv' }), fileName);
    return this.request('POST', '/api/holdouts', form);
  }

  /**
   * Streams the file as the multipart field `file`, `chunkBytes` at a time with `pauseMs` between
   * chunks. `onSent` runs once the whole body is written. Resolves with the status, or with
   * `error` when the connection broke (the server was killed).
   */
  async streamUpload(file: string, options: { chunkBytes?: number; pauseMs?: number; onSent?: () => void; fileName?: string } = {}): Promise<{ status?: number; body?: string; error?: string }> {
    const token = await this.token();
    const boundary = `----scorecourt-reliability-${Date.now()}`;
    const head = Buffer.from(
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${options.fileName ?? path.basename(file)}"\r\nContent-Type: text/csv\r\n\r\n`,
    );
    const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
    const size = statSync(file).size;
    const url = new URL(`${this.baseUrl}/api/holdouts`);
    return new Promise((resolve) => {
      let settled = false;
      const done = (value: { status?: number; body?: string; error?: string }) => {
        if (!settled) {
          settled = true;
          resolve(value);
        }
      };
      const request = http.request(
        {
          host: url.hostname,
          port: url.port,
          path: url.pathname,
          method: 'POST',
          headers: {
            Cookie: this.cookie,
            'X-CSRF-Token': token,
            'Content-Type': `multipart/form-data; boundary=${boundary}`,
            'Content-Length': head.length + size + tail.length,
          },
        },
        (response) => {
          let body = '';
          response.on('data', (chunk: Buffer) => (body += chunk.toString()));
          response.on('end', () => done({ status: response.statusCode, body }));
          response.on('error', (error) => done({ error: error.message }));
        },
      );
      request.on('error', (error) => done({ error: error.message }));
      void (async () => {
        request.write(head);
        const stream = createReadStream(file, { highWaterMark: options.chunkBytes ?? 1 << 20 });
        try {
          for await (const chunk of stream as AsyncIterable<Buffer>) {
            if (settled || request.destroyed) break;
            if (!request.write(chunk)) {
              await new Promise<void>((resolve) => {
                const go = () => {
                  request.off('drain', go);
                  request.off('close', go);
                  resolve();
                };
                request.on('drain', go);
                request.on('close', go);
              });
            }
            if (options.pauseMs) await new Promise((resolve) => setTimeout(resolve, options.pauseMs));
          }
          if (!settled && !request.destroyed) {
            request.end(tail);
            options.onSent?.();
          }
        } catch (error) {
          done({ error: (error as Error).message });
        } finally {
          stream.destroy();
        }
      })();
    });
  }
}
