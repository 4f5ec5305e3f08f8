import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from '@server/config';

function problems(env: Record<string, string>): string[] {
  try {
    loadConfig(env);
  } catch (error) {
    if (error instanceof ConfigError) return error.problems;
    throw error;
  }
  return [];
}

describe('configuration', () => {
  it('has working defaults for a developer machine', () => {
    const config = loadConfig({});
    expect(config).toMatchObject({
      env: 'development',
      port: 3000,
      databasePath: 'data/scorecourt.sqlite',
      sessionSecret: undefined,
      smtpUrl: undefined,
      publicUrl: 'http://localhost:3000',
      uploadLimitMb: 200,
      analysisConcurrency: 1,
      serveClient: true,
      bcryptCost: 12,
      trustProxy: false,
      demoScenario: true,
    });
    expect(loadConfig({ DEMO_SCENARIO: 'false' }).demoScenario).toBe(false);
  });

  it('derives PUBLIC_URL from PORT and trims a trailing slash from a given one', () => {
    expect(loadConfig({ PORT: '8080' }).publicUrl).toBe('http://localhost:8080');
    expect(loadConfig({ PUBLIC_URL: 'https://scorecourt.tallowmere.test/' }).publicUrl).toBe('https://scorecourt.tallowmere.test');
  });

  it('names each bad variable', () => {
    const found = problems({ PORT: 'eighty', UPLOAD_LIMIT_MB: '0', SMTP_URL: 'http://mail', SERVE_CLIENT: 'maybe' });
    expect(found.map((line) => line.split(':')[0]).sort()).toEqual(['PORT', 'SERVE_CLIENT', 'SMTP_URL', 'UPLOAD_LIMIT_MB']);
  });

  it('requires SESSION_SECRET and bcrypt cost 12 in production', () => {
    const found = problems({ NODE_ENV: 'production', BCRYPT_COST: '4' });
    expect(found).toEqual(['SESSION_SECRET: required when NODE_ENV=production', 'BCRYPT_COST: must be at least 12 when NODE_ENV=production']);
    expect(problems({ NODE_ENV: 'production', SESSION_SECRET: 'short' })).toEqual(['SESSION_SECRET: use at least 32 characters']);
    expect(loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 's'.repeat(32) }).isProduction).toBe(true);
  });

  it('treats an empty variable as unset', () => {
    expect(loadConfig({ SMTP_URL: '', PORT: '' })).toMatchObject({ smtpUrl: undefined, port: 3000 });
  });

  it('accepts smtp and smtps URLs and the usual boolean words', () => {
    expect(loadConfig({ SMTP_URL: 'smtps://user:pw@mail.tallowmere.test:465' }).smtpUrl).toBe('smtps://user:pw@mail.tallowmere.test:465');
    expect(loadConfig({ SERVE_CLIENT: 'false' }).serveClient).toBe(false);
    expect(loadConfig({ SERVE_CLIENT: '1' }).serveClient).toBe(true);
    expect(loadConfig({ TRUST_PROXY: '1' }).trustProxy).toBe(1);
  });
});
