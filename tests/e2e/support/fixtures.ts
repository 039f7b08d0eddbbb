/** What tests/e2e/run.ts tells the specs about the server it started and the demo it seeded. */
export type E2EFixtures = {
  baseUrl: string;
  mailUrl: string;
  artifactsDir: string;
  password: string;
  accounts: { key: string; email: string; name: string; role: string }[];
  /** A ready session cookie header per demo account, opened through the API before the server started. */
  cookies: Record<string, string>;
  caseOfSupplier: { id: string; number: string };
  /** A delivery of supplier@'s organisation, for the page that opens a dispute. */
  deliveryOfSupplier: { id: string };
};

export function fixtures(): E2EFixtures {
  const raw = process.env.E2E_FIXTURES;
  if (!raw) throw new Error('E2E_FIXTURES is not set: run the browser tests with `npm run test:e2e`.');
  return JSON.parse(raw) as E2EFixtures;
}

export function account(key: string) {
  const found = fixtures().accounts.find((a) => a.key === key);
  if (!found) throw new Error(`No demo account ${key}`);
  return found;
}
