// Child process for lock.test.ts: takes the folder lock, says so, and holds it until killed
// (or, with "exit", releases it by exiting normally).
import { lockDataDir } from '../lock';

const [dir, mode] = process.argv.slice(2);
if (!dir) throw new Error('usage: lock-holder <dir> [exit]');
lockDataDir(dir);
process.stdout.write('locked\n');
if (mode === 'exit') process.exit(0);
setInterval(() => undefined, 60_000);
