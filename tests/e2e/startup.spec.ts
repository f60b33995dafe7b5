import { expect, test } from '@playwright/test';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../..', import.meta.url));
const webDir = path.join(root, 'apps', 'web');
const dbDir = path.join(root, 'packages', 'db');

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      server.close(() => resolve(typeof address === 'object' && address ? address.port : 0));
    });
  });
}

function exitOf(child: ChildProcess): Promise<number | null> {
  if (child.exitCode !== null) return Promise.resolve(child.exitCode);
  return new Promise((resolve) => child.once('exit', (code) => resolve(code)));
}

test('start-up – a data folder held by a live server stops `next start` with the holder named', async () => {
  const folder = mkdtempSync(path.join(os.tmpdir(), 'rw-startup-'));
  const dataDir = path.join(folder, 'pglite');
  // A live process holding the folder, as a server started earlier would.
  const holder = spawn(process.execPath, ['--import', 'tsx', 'src/test/lock-holder.ts', dataDir], {
    cwd: dbDir,
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  try {
    await new Promise<void>((resolve, reject) => {
      holder.stdout!.on('data', (chunk: Buffer) => {
        if (chunk.toString().includes('locked')) resolve();
      });
      holder.once('exit', () => reject(new Error('the lock holder exited early')));
    });

    const port = await freePort();
    const server = spawn(
      process.execPath,
      [
        'node_modules/next/dist/bin/next',
        'start',
        '--hostname',
        '127.0.0.1',
        '--port',
        String(port),
      ],
      {
        cwd: webDir,
        env: {
          ...process.env,
          DATABASE_URL: '',
          PGLITE_DATA_DIR: dataDir,
          NEXTAUTH_SECRET: 'end-to-end-tests-only-secret-0123456789',
          NEXTAUTH_URL: `http://127.0.0.1:${port}`,
        },
        stdio: ['ignore', 'pipe', 'pipe'],
      },
    );
    let output = '';
    server.stdout!.on('data', (chunk: Buffer) => (output += chunk.toString()));
    server.stderr!.on('data', (chunk: Buffer) => (output += chunk.toString()));
    const code = await Promise.race([
      exitOf(server),
      new Promise<'running'>((resolve) => setTimeout(() => resolve('running'), 45_000)),
    ]);
    if (code === 'running') server.kill('SIGKILL');

    expect(code).not.toBe('running');
    expect(code).not.toBe(0);
    expect(output).toContain(
      `Reelwright cannot start: The database folder ${dataDir} is in use by process ${holder.pid} (on ${os.hostname()},`,
    );
  } finally {
    holder.kill('SIGKILL');
    await exitOf(holder);
    rmSync(folder, { recursive: true, force: true });
  }
});
