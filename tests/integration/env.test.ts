import { describe, expect, it } from 'vitest';
import { EnvError, parseEnv } from '@/lib/env';

const secret = 'x'.repeat(48);

function problemsOf(source: Record<string, string | undefined>): string[] {
  try {
    parseEnv(source);
  } catch (error) {
    expect(error).toBeInstanceOf(EnvError);
    return (error as EnvError).problems;
  }
  throw new Error('parseEnv accepted settings it should refuse');
}

describe('parseEnv', () => {
  it('gives working defaults for a laptop', () => {
    const settings = parseEnv({});
    expect(settings.APP_ENV).toBe('development');
    expect(settings.DATABASE_URL).toBeUndefined();
    expect(settings.PGLITE_DIR).toBe('data/pglite');
    expect(settings.PGLITE_SHARED_BUFFERS).toBe('24MB');
  });

  it.each([
    ['DATABASE_URL', 'mysql://db.example.test/countersample'],
    ['APP_ENV', 'staging'],
    ['BETTER_AUTH_URL', 'ftp://example.test'],
    ['BETTER_AUTH_SECRET', 'too-short'],
    ['SMTP_URL', 'http://mail.example.test'],
    ['MAIL_CATCHER_URL', 'not a url'],
    ['PGLITE_SHARED_BUFFERS', '24'],
    ['PGLITE_SHARED_BUFFERS', '24MB; drop table'],
    ['DEMO_PASSWORD', 'short'],
  ])('names %s when it is wrong, and only it', (name, value) => {
    const problems = problemsOf({ [name]: value });
    expect(problems).toHaveLength(1);
    expect(problems[0].startsWith(`${name}:`)).toBe(true);
  });

  it('names every bad variable at once, and says so in the message', () => {
    try {
      parseEnv({ DATABASE_URL: 'mysql://x', SMTP_URL: 'http://x' });
      expect.unreachable();
    } catch (error) {
      expect((error as EnvError).problems.map((p) => p.split(':')[0]).sort()).toEqual(['DATABASE_URL', 'SMTP_URL']);
      expect((error as Error).message).toContain('DATABASE_URL');
      expect((error as Error).message).toContain('SMTP_URL');
    }
  });

  it('refuses production without a secret of its own', () => {
    const problems = problemsOf({ APP_ENV: 'production', BETTER_AUTH_URL: 'https://cases.example.test' });
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(/^BETTER_AUTH_SECRET: .*production/);
  });

  it('treats an empty secret in production as missing', () => {
    expect(problemsOf({ APP_ENV: 'production', BETTER_AUTH_SECRET: '' })[0]).toMatch(/^BETTER_AUTH_SECRET:/);
  });

  it('accepts production with its own secret', () => {
    const settings = parseEnv({ APP_ENV: 'production', BETTER_AUTH_SECRET: secret, BETTER_AUTH_URL: 'https://cases.example.test' });
    expect(settings.APP_ENV).toBe('production');
    expect(settings.BETTER_AUTH_SECRET).toBe(secret);
  });

  it('takes postgres:// and postgresql:// URLs', () => {
    expect(parseEnv({ DATABASE_URL: 'postgres://u:p@127.0.0.1:5432/db' }).DATABASE_URL).toBe('postgres://u:p@127.0.0.1:5432/db');
    expect(parseEnv({ DATABASE_URL: 'postgresql://u:p@127.0.0.1/db' }).DATABASE_URL).toBe('postgresql://u:p@127.0.0.1/db');
  });
});
