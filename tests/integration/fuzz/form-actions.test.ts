import { vi } from 'vitest';
import { fuzzGroup } from './suite';

vi.mock('next/headers', async () => (await import('./next-stubs')).nextHeaders);
vi.mock('next/cache', async () => (await import('./next-stubs')).nextCache);
vi.mock('next/navigation', async (importOriginal) => ({ ...(await importOriginal<object>()), ...(await import('./next-stubs')).nextNavigation }));

// FormData actions: every table is compared, none is excluded.
fuzzGroup('form-actions');
