import { closeDb } from './client';
import { migrate } from './migrate';

await migrate();
await closeDb();
console.log('Migrations applied.');
