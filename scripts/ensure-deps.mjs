// Installs the npm packages when they are missing or older than the lock file, so that a fresh
// clone needs nothing but `npm run demo` or `npm test`.
import { execSync } from 'node:child_process';
import fs from 'node:fs';

const installed = 'node_modules/.package-lock.json';
const stale = !fs.existsSync(installed) || fs.statSync('package-lock.json').mtimeMs > fs.statSync(installed).mtimeMs + 1000;
if (stale) {
  console.log('Installing npm packages (npm ci)…');
  execSync('npm ci --no-audit --no-fund', { stdio: 'inherit' });
}
