import { vi } from 'vitest';
import { fuzzGroup } from './suite';

vi.mock('next/headers', async () => (await import('./next-stubs')).nextHeaders);
vi.mock('next/cache', async () => (await import('./next-stubs')).nextCache);
vi.mock('next/navigation', async (importOriginal) => ({ ...(await importOriginal<object>()), ...(await import('./next-stubs')).nextNavigation }));

// rate_limit is left out of the comparison: signing a decision counts every wrong password there
// (lib/dal/decision-auth.ts) so that guessing is throttled; that count is the one change a refused
// attempt must make.
fuzzGroup('value-actions', { exclude: ['rate_limit'] });
