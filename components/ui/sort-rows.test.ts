import { describe, expect, it } from 'vitest';

import { type Column, sortRows } from './sort-rows';

type Row = { name: string; n: number | null };
const cols: Column<Row>[] = [
  { key: 'name', label: 'Name', sort: (r) => r.name, cell: (r) => r.name },
  { key: 'n', label: 'Count', sort: (r) => r.n, cell: (r) => String(r.n) },
  { key: 'plain', label: 'Plain', cell: () => '' },
];
const rows: Row[] = [
  { name: 'Oxlow', n: 3 },
  { name: 'Brackenridge', n: null },
  { name: 'Corvid', n: 12 },
  { name: 'Anvil', n: 3 },
];

describe('sortable table order', () => {
  it('sorts numbers as numbers, names as words, keeps ties in order and blanks last both ways', () => {
    expect(sortRows(rows, cols, { key: 'n', dir: 'asc' }).map((r) => r.name)).toEqual([
      'Oxlow',
      'Anvil',
      'Corvid',
      'Brackenridge',
    ]);
    expect(sortRows(rows, cols, { key: 'n', dir: 'desc' }).map((r) => r.name)).toEqual([
      'Corvid',
      'Oxlow',
      'Anvil',
      'Brackenridge',
    ]);
    expect(sortRows(rows, cols, { key: 'name', dir: 'asc' }).map((r) => r.name)).toEqual([
      'Anvil',
      'Brackenridge',
      'Corvid',
      'Oxlow',
    ]);
    // a column with nothing to sort by, or none chosen: the order given
    expect(sortRows(rows, cols, { key: 'plain', dir: 'asc' })).toEqual(rows);
    expect(sortRows(rows, cols, null)).toEqual(rows);
  });
});
