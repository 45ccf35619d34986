import fs from 'node:fs';
import path from 'node:path';

import { describe, expect, it } from 'vitest';

import { migrationSource } from './sources';

describe('the migration list', () => {
  it('names every file in migrations/, in order, so none is skipped under tsx or vitest', async () => {
    const files = fs
      .readdirSync(path.resolve(__dirname, '../../migrations'))
      .filter((f) => /^\d{14}_.+\.ts$/.test(f))
      .sort();
    const listed = await migrationSource.getMigrations([]);
    expect(listed).toEqual(files);
  });
});
