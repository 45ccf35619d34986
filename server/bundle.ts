import fs from 'node:fs';
import path from 'node:path';

import { build } from 'esbuild';

/**
 * The server runs as one plain JavaScript file under `node`, not through tsx: tsx
 * compiles every module it loads, the packages' too, and keeps each function's name
 * with a call per closure created, which cost the MQTT and ingest path about a third
 * of its throughput (bench:ingest, one reading per message: 15.5k/s under tsx,
 * 22k/s bundled). esbuild resolves the `@/` paths from tsconfig.json; packages stay
 * in node_modules. Takes well under a second.
 */
export async function bundle(root: string, entry: string, outfile: string): Promise<string> {
  const out = await build({
    absWorkingDir: root,
    entryPoints: [entry],
    outfile: path.resolve(root, outfile),
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'cjs',
    packages: 'external',
    sourcemap: 'linked',
    logLevel: 'warning',
    write: false,
  });
  // written aside and renamed: a process starting from the bundle never reads half of one
  for (const f of out.outputFiles) {
    fs.mkdirSync(path.dirname(f.path), { recursive: true });
    const aside = `${f.path}.${process.pid}.tmp`;
    fs.writeFileSync(aside, f.contents);
    fs.renameSync(aside, f.path);
  }
  return path.resolve(root, outfile);
}

/** The server process's bundle: built from server/serve.ts into build/ (ignored by git). */
export const bundleServer = (root: string) => bundle(root, 'server/serve.ts', 'build/serve.cjs');

/**
 * Node's flags for the server process. A 64 MB young generation: ingest allocates a
 * few objects per reading and the default 16 MB semi-space made garbage collection
 * 18 % of the ingest profile (9 % with this); stack traces point into the sources.
 */
export const serverNodeArgs = ['--max-semi-space-size=64', '--enable-source-maps'];
