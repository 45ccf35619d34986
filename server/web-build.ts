import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const sources = ['app', 'components', 'telemetry', 'assets', 'app.json', 'package.json'];

function newestMtime(p: string): number {
  if (!fs.existsSync(p)) return 0;
  const st = fs.statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of fs.readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)));
  return newest;
}

/** True when dist/ is missing or older than any source of the web app. */
export function webExportIsStale(root: string): boolean {
  const index = path.join(root, 'dist', 'index.html');
  if (!fs.existsSync(index)) return true;
  const built = fs.statSync(index).mtimeMs;
  return sources.some((s) => newestMtime(path.join(root, s)) > built);
}

export async function buildWebExport(root: string, log: (l: string) => void = console.log): Promise<void> {
  log('Building the web app (expo export --platform web)…');
  const started = Date.now();
  await new Promise<void>((resolve, reject) => {
    const child = spawn(
      process.execPath,
      [path.join(root, 'node_modules/expo/bin/cli'), 'export', '--platform', 'web', '--output-dir', 'dist'],
      {
        cwd: root,
        stdio: ['ignore', 'pipe', 'pipe'],
        env: { ...process.env, CI: '1', EXPO_OFFLINE: '1', EXPO_NO_TELEMETRY: '1' },
      },
    );
    let out = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (out += d));
    child.once('exit', (code) =>
      code === 0 ? resolve() : reject(new Error(`expo export failed (${code}):\n${out.slice(-4000)}`)),
    );
  });
  log(`Web app built in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}
