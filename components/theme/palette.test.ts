import fs from 'node:fs';
import path from 'node:path';

import { describe, expect, it } from 'vitest';

import { priorities } from '@/telemetry/alarms/machine';

import { colourTable, palette, priorityColour } from './palette';

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

  it('the table gives every colour one meaning, priorities first, then states, then neutral information', () => {
    const entries = Object.entries(colourTable);
    const groups = entries.map(([, e]) => e.group);
    const order = ['priority', 'state', 'neutral'];
    expect([...groups].sort((a, b) => order.indexOf(a) - order.indexOf(b))).toEqual(groups);
    expect(entries.filter(([, e]) => e.group === 'priority').map(([k]) => k)).toEqual([...priorities]);
    const values = entries.flatMap(([, e]) => [e.fg, e.bg]);
    for (const v of values) expect(v).toMatch(/^#[0-9a-f]{6}$/);
    // one value, one meaning: white is the one shared value (a card, and text on the dark link-lost banner)
    const dup = values.filter((v, i) => values.indexOf(v) !== i);
    expect(dup).toEqual(['#ffffff']);
    for (const [, e] of entries) expect(e.meaning.length).toBeGreaterThan(10);
  });

  it('no screen takes a priority colour except through priorityColour (a form error is not a critical alarm)', () => {
    expect(Object.keys(palette).filter((k) => /critical|high|medium|low/.test(k))).toEqual([]);
    for (const p of priorities) expect(priorityColour(p)).toEqual({ fg: colourTable[p].fg, bg: colourTable[p].bg });
  });

  it('DEVELOPERS.md carries the same table', () => {
    const doc = fs.readFileSync(path.join(root, 'DEVELOPERS.md'), 'utf8');
    for (const [k, e] of Object.entries(colourTable)) {
      expect(doc, k).toContain(`| \`${k}\` | ${e.fg} on ${e.bg} | ${e.meaning} |`);
    }
  });
});
