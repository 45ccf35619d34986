/**
 * Runs a benchmark as the server ships: bundled into build/bench/<name>.cjs and run
 * by plain `node` with the server's flags (server/bundle.ts), not through tsx.
 *   npx tsx test/bench/built.ts ingest --batch 1
 */
import { spawn } from 'node:child_process';

import { bundle, serverNodeArgs } from '@/server/bundle';
import { projectRoot } from '@/server/config';

async function main() {
  const [name, ...args] = process.argv.slice(2);
  if (!name || !/^[a-z-]+$/.test(name)) throw new Error('usage: built.ts <bench name> [options]');
  const file = await bundle(projectRoot(), `test/bench/${name}.ts`, `build/bench/${name}.cjs`);
  const child = spawn(process.execPath, [...serverNodeArgs, file, ...args], { stdio: 'inherit' });
  child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
}

main().catch((e) => {
  console.error((e as Error).message);
  process.exit(1);
});
