import fs from 'node:fs';
import path from 'node:path';

import { describe, expect, it } from 'vitest';

import { palette } from './palette';

const root = path.resolve(__dirname, '../..');
const rawColour =
  /#[0-9a-f]{3,8}\b|\brgba?\(|\bhsla?\(|['"](white|black|red|green|blue|orange|purple|gray|grey|yellow)['"]/i;

function sources(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) return p.endsWith(path.join('components', 'theme')) ? [] : sources(p);
    return /\.(ts|tsx)$/.test(e.name) && !e.name.endsWith('.test.ts') ? [p] : [];
  });
}

describe('colour comes from the theme only', () => {
  it('no screen or component writes a raw colour; each takes its meaning from components/theme/palette.ts', () => {
    const found = [...sources(path.join(root, 'app')), ...sources(path.join(root, 'components'))].flatMap((file) =>
      fs
        .readFileSync(file, 'utf8')
        .split('\n')
        .map((line, i) => ({ line, i }))
        .filter(({ line }) => rawColour.test(line) && !line.trim().startsWith('//') && !line.trim().startsWith('*'))
        .map(({ line, i }) => `${path.relative(root, file)}:${i + 1}: ${line.trim()}`),
    );
    expect(found).toEqual([]);
  });

  it('the palette itself is hex colours, each used for one name', () => {
    const values = Object.values(palette);
    for (const v of values) expect(v).toMatch(/^#[0-9a-f]{6}$/);
    // two names with one value would be one colour carrying two meanings (surface and onAccent are both white by design)
    const dup = values.filter((v, i) => values.indexOf(v) !== i);
    expect(dup).toEqual(['#ffffff']);
  });
});
