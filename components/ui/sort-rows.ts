import type { ReactNode } from 'react';

export type Column<T> = {
  key: string;
  label: string;
  /** what the column sorts by; a column without it does not sort */
  sort?: (row: T) => number | string | null;
  cell: (row: T) => ReactNode;
  /** relative width (flex); 1 when left out */
  grow?: number;
  align?: 'left' | 'right';
};

export type SortState = { key: string; dir: 'asc' | 'desc' } | null;

/** Rows in the order a column asks for; blanks last either way, ties kept in their given order. */
export function sortRows<T>(rows: T[], columns: Column<T>[], sort: SortState): T[] {
  const col = sort && columns.find((c) => c.key === sort.key);
  if (!col?.sort) return rows;
  const by = col.sort;
  const sign = sort!.dir === 'asc' ? 1 : -1;
  return rows
    .map((row, i) => ({ row, i, v: by(row) }))
    .sort((a, b) => {
      if (a.v == null || b.v == null) return a.v == null ? (b.v == null ? a.i - b.i : 1) : -1;
      const c = typeof a.v === 'number' && typeof b.v === 'number' ? a.v - b.v : String(a.v).localeCompare(String(b.v));
      return c === 0 ? a.i - b.i : c * sign;
    })
    .map((x) => x.row);
}
