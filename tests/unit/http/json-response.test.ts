import { describe, expect, it } from 'vitest';
import { jsonResponse } from '@/lib/http/json-response';
import { problemResponse } from '@/lib/http/problem';
import { AppError } from '@/lib/errors';

describe('jsonResponse', () => {
  it('marks a small answer no-transform, keeping the caching it was given, so the server does not gzip it', async () => {
    const response = jsonResponse({ limit: '−0.520 °C' }, { headers: { 'cache-control': 'no-store' } });
    expect(response.headers.get('cache-control')).toBe('no-store, no-transform');
    expect(response.headers.get('content-type')).toBe('application/json');
    expect(await response.json()).toEqual({ limit: '−0.520 °C' });
  });

  it('leaves a large answer to be compressed', () => {
    const response = jsonResponse({ items: Array.from({ length: 100 }, (_, i) => ({ id: i, note: 'Cool box, 0–6 °C' })) }, { headers: { 'cache-control': 'no-store' } });
    expect(response.headers.get('cache-control')).toBe('no-store');
  });

  it('counts bytes, not characters: 1,000 characters of “°” are 2,000 bytes and may be compressed', () => {
    const response = jsonResponse({ text: '°'.repeat(1000) });
    expect(response.headers.get('cache-control')).toBeNull();
  });

  it('keeps the status and headers it is given, and a content type the caller set', () => {
    const response = jsonResponse({ ok: true }, { status: 201, headers: { location: '/api/v1/cases/1', 'content-type': 'application/problem+json' } });
    expect(response.status).toBe(201);
    expect(response.headers.get('location')).toBe('/api/v1/cases/1');
    expect(response.headers.get('content-type')).toBe('application/problem+json');
    expect(response.headers.get('cache-control')).toBe('no-transform');
  });

  it('is how problem details are answered', () => {
    const response = problemResponse(new AppError('not_found', 'That case was not found.'), '/api/v1/cases/x');
    expect(response.headers.get('content-type')).toBe('application/problem+json');
    expect(response.headers.get('cache-control')).toBe('no-store, no-transform');
  });
});
