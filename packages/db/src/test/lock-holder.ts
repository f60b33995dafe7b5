// Child process for lock.test.ts: takes the folder lock, says so, and holds it until killed
// (or, with "exit", releases it by exiting normally; with "busy", blocks its main thread).
import { lockDataDir } from '../lock';

const [dir, mode] = process.argv.slice(2);
if (!dir) throw new Error('usage: lock-holder <dir> [exit]');
await lockDataDir(dir, { heartbeatMs: Number(process.env.LOCK_HEARTBEAT_MS) || undefined });
process.stdout.write('locked\n');
if (mode === 'exit') process.exit(0);
// What a long PGlite statement does to the main thread: the heartbeat must go on regardless.
if (mode === 'busy') Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 60_000);
setInterval(() => undefined, 60_000);
