/**
 * `npm start`: builds the client with Vite when dist/client is missing or older than any source file
 * (src/, shared/, index.html, vite.config.ts), then runs the server in production mode serving
 * dist/client with an SPA fallback.
 */
import fs from 'node:fs';
import path from 'node:path';

process.env.NODE_ENV ??= 'production';

const { CLIENT_DIST_DIR, ROOT_DIR, runServer } = await import('./index');

const SOURCES = ['src', 'shared', 'index.html', 'vite.config.ts'];

/** Newest modification time (ms) among the files under `p`; 0 when it does not exist. */
function newestMtime(p: string): { mtime: number; file: string } {
  let best = { mtime: 0, file: '' };
  let stat: fs.Stats;
  try {
    stat = fs.statSync(p);
  } catch {
    return best;
  }
  if (!stat.isDirectory()) return { mtime: stat.mtimeMs, file: p };
  for (const entry of fs.readdirSync(p)) {
    if (entry === 'node_modules' || entry.startsWith('.')) continue;
    const sub = newestMtime(path.join(p, entry));
    if (sub.mtime > best.mtime) best = sub;
  }
  return best;
}

function buildReason(): string | null {
  const index = path.join(CLIENT_DIST_DIR, 'index.html');
  if (!fs.existsSync(index)) return 'dist/client is missing';
  const built = fs.statSync(index).mtimeMs;
  let newest = { mtime: 0, file: '' };
  for (const s of SOURCES) {
    const m = newestMtime(path.join(ROOT_DIR, s));
    if (m.mtime > newest.mtime) newest = m;
  }
  if (newest.mtime > built) return `${path.relative(ROOT_DIR, newest.file)} is newer than the build`;
  return null;
}

const reason = buildReason();
if (reason) {
  console.log(`Building the client (${reason}) …`);
  const started = Date.now();
  try {
    const { build } = await import('vite');
    await build({ root: ROOT_DIR, configFile: path.join(ROOT_DIR, 'vite.config.ts'), mode: 'production', logLevel: 'warn' });
    console.log(`Client built into dist/client in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
  } catch (err) {
    console.error('\nThe client build FAILED:\n');
    console.error(`  ${(err as Error).message?.split('\n').join('\n  ')}\n`);
    if (fs.existsSync(path.join(CLIENT_DIST_DIR, 'index.html'))) {
      console.error('Serving the previous build in dist/client instead.\n');
    } else {
      console.error('There is no previous build to serve. Fix the error above and run `npm start` again.\n');
      process.exit(1);
    }
  }
} else {
  console.log('The client build in dist/client is up to date.');
}

await runServer({ client: () => ({ mode: 'static', dir: CLIENT_DIST_DIR }) });
