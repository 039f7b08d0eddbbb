import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { fixtures } from '../support/fixtures';

// `npm run db:backup` while the production server holds the embedded database: the script must not
// open the folder itself but ask the server, which answers only on loopback and with the token it
// wrote beside the folder at start. The archive then restores into a new folder whose audit chain
// verifies with the ordinary script.

const root = process.cwd();
const tsxCli = path.join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs');
const work = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-backup-e2e-'));
const serverDir = process.env.PGLITE_DIR!;
// The runner keeps the upload service's storage beside the database folder.
const serverUploads = path.join(path.dirname(serverDir), 'uploads');

function run(script: string, args: string[], env: Record<string, string> = {}) {
  const child = spawn(process.execPath, [tsxCli, '--import', './scripts/register-server-only.mjs', script, ...args], { cwd: root, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  child.stdout.on('data', (d) => (output += d));
  child.stderr.on('data', (d) => (output += d));
  return new Promise<{ code: number; output: string }>((resolve) => child.once('exit', (code) => resolve({ code: code ?? 1, output })));
}

const endpoint = () => JSON.parse(fs.readFileSync(`${path.resolve(serverDir)}.backup-endpoint.json`, 'utf8')) as { pid: number; port: number | null; token: string };
const backupUrl = () => `${fixtures().baseUrl}/api/internal/backup`;

afterAll(() => {
  fs.rmSync(work, { recursive: true, force: true });
});

describe('backup while the server runs', () => {
  const archive = path.join(work, 'running.tar.gz');

  it('publishes a token readable by its own user only, naming the process that holds the folder', () => {
    const file = `${path.resolve(serverDir)}.backup-endpoint.json`;
    expect(fs.statSync(file).mode & 0o077).toBe(0);
    expect(endpoint().pid).toBe(Number(fs.readFileSync(`${path.resolve(serverDir)}.lock`, 'utf8')));
    expect(endpoint().port).toBe(Number(new URL(fixtures().baseUrl).port));
  });

  it('refuses a request without the token, with a wrong one, or from another machine', async () => {
    const none = await fetch(backupUrl(), { method: 'POST' });
    expect(none.status).toBe(401);
    expect(none.headers.get('content-type')).toBe('application/problem+json');
    const wrong = await fetch(backupUrl(), { method: 'POST', headers: { authorization: `Bearer ${'0'.repeat(64)}` } });
    expect(wrong.status).toBe(401);
    const remote = await fetch(backupUrl(), { method: 'POST', headers: { authorization: `Bearer ${endpoint().token}`, 'x-forwarded-for': '203.0.113.7' } });
    expect(remote.status).toBe(403);
    const proxied = await fetch(backupUrl(), { method: 'POST', headers: { authorization: `Bearer ${endpoint().token}`, 'x-forwarded-for': '127.0.0.1, 198.51.100.4' } });
    expect(proxied.status).toBe(403);
  });

  it('takes the snapshot through the server while it keeps answering, and the archive restores into a new folder', async () => {
    // The server goes on serving while it dumps: a reader in parallel must keep getting answers.
    let answered = 0;
    let stop = false;
    const reader = (async () => {
      while (!stop) {
        const response = await fetch(`${fixtures().baseUrl}/api/v1/cases`, { headers: { cookie: fixtures().cookies.arbiter } });
        expect(response.status).toBe(200);
        await response.arrayBuffer();
        answered += 1;
      }
    })();
    const backup = await run('scripts/db-backup.ts', ['--out', archive, '--uploads', serverUploads]);
    stop = true;
    await reader;
    expect(backup.output).toContain(`asking it for a snapshot at http://127.0.0.1:${endpoint().port}`);
    expect(backup.code, backup.output).toBe(0);
    expect(answered).toBeGreaterThan(0);

    const into = path.join(work, 'restored');
    const restore = await run('scripts/db-restore.ts', [archive, '--into', into]);
    expect(restore.code, restore.output).toBe(0);
    expect(restore.output).toContain(`PGLITE_DIR=${path.join(into, 'pglite')}`);
    const verify = await run('scripts/audit-verify.ts', [], { PGLITE_DIR: path.join(into, 'pglite') });
    expect(verify.code, verify.output).toBe(0);
    expect(verify.output).toMatch(/Audit chain intact: [1-9]\d* events checked/);

    // A second restore of the same archive into the folder just filled is refused.
    const again = await run('scripts/db-restore.ts', [archive, '--into', into]);
    expect(again.code).toBe(1);
    expect(again.output).toContain('is not empty');
  });
});
