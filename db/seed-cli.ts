import { closeDb, getDb } from './client';
import { migrate } from './migrate';
import { seedDemo } from './seed/demo';
import { env } from '@/lib/env';

await migrate();
const started = Date.now();
const result = await seedDemo(getDb(), { password: env().DEMO_PASSWORD });
await closeDb();
console.log(result.seeded ? `Demo scenario seeded in ${((Date.now() - started) / 1000).toFixed(1)} s.` : 'Demo scenario already present; nothing changed.');
