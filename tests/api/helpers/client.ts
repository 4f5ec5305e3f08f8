import type { Role } from '@shared/roles';
import type { Express } from 'express';
import request from 'supertest';
import { demoPassword } from '@server/seed';

/**
 * A browser-like client: keeps cookies, fetches the CSRF token first, sends it on every
 * mutation, and picks up the new token that signing in or out returns.
 */
export class TestClient {
  readonly agent: ReturnType<typeof request.agent>;
  csrf: string | null = null;

  constructor(readonly app: Express) {
    this.agent = request.agent(app);
  }

  async fetchCsrf(): Promise<string> {
    const response = await this.agent.get('/api/auth/csrf').expect(200);
    this.csrf = (response.body as { token: string }).token;
    return this.csrf;
  }

  private remember(response: request.Response): request.Response {
    const renewed = response.headers['x-csrf-token'];
    if (typeof renewed === 'string') this.csrf = renewed;
    return response;
  }

  get(path: string) {
    return this.agent.get(path);
  }

  /** A mutation with the CSRF header (fetched first when needed). */
  async send(method: 'post' | 'put' | 'patch' | 'delete', path: string, body?: unknown): Promise<request.Response> {
    const token = this.csrf ?? (await this.fetchCsrf());
    let call = this.agent[method](path).set('X-CSRF-Token', token);
    if (body !== undefined) call = call.send(body as object);
    return this.remember(await call);
  }

  post(path: string, body?: unknown) {
    return this.send('post', path, body);
  }

  patch(path: string, body?: unknown) {
    return this.send('patch', path, body);
  }

  async signIn(email: string, password = demoPassword): Promise<request.Response> {
    return this.post('/api/auth/login', { email, password });
  }

  /** The session cookie's value as the server set it last (the signed session id). */
  sessionCookie(response: request.Response): string | null {
    const cookies = response.headers['set-cookie'] as unknown as string[] | undefined;
    const cookie = cookies?.find((value) => value.startsWith('scorecourt.sid='));
    return cookie ? cookie.split(';')[0] : null;
  }
}

/** A client signed in as the demo person of that role (admin@…, modeler@…). */
export async function signedInAs(app: Express, role: Role): Promise<TestClient> {
  const client = new TestClient(app);
  const response = await client.signIn(`${role}@tallowmere.test`);
  if (response.status !== 200) throw new Error(`sign-in as ${role} failed: ${response.status} ${JSON.stringify(response.body)}`);
  return client;
}
