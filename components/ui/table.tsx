import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';

import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';

import { type Column, sortRows, type SortState } from './sort-rows';
import { Text } from './text';

export type { Column, SortState } from './sort-rows';

/**
 * A table for wide screens: a header that sorts by a column when pressed (again to turn
 * the order), with `aria-sort` so the order is announced. Phones show their own cards.
 */
export function Table<T>({
  label,
  columns,
  rows,
  rowKey,
  initialSort = null,
  rowLabel,
}: {
  label: string;
  columns: Column<T>[];
  rows: T[];
  rowKey: (row: T) => string | number;
  initialSort?: SortState;
  rowLabel?: (row: T) => string;
}) {
  const [sort, setSort] = useState<SortState>(initialSort);
  const shown = sortRows(rows, columns, sort);
  return (
    <View role="table" aria-label={label} style={styles.table}>
      <View role="row" style={[styles.row, styles.head]}>
        {columns.map((c) => {
          const on = sort?.key === c.key;
          const order = on ? (sort!.dir === 'asc' ? 'ascending' : 'descending') : 'none';
          const text = (
            <Text variant="small" strong style={{ textAlign: c.align ?? 'left' }}>
              {c.label}
              {on ? (sort!.dir === 'asc' ? ' ↑' : ' ↓') : ''}
            </Text>
          );
          return (
            <View key={c.key} role="columnheader" aria-sort={c.sort ? order : undefined} style={cellStyle(c)}>
              {c.sort ? (
                <Pressable
                  role="button"
                  aria-label={`Sort by ${c.label}`}
                  style={styles.sorter}
                  onPress={() =>
                    setSort(on && sort!.dir === 'asc' ? { key: c.key, dir: 'desc' } : { key: c.key, dir: 'asc' })
                  }
                >
                  {text}
                </Pressable>
              ) : (
                text
              )}
            </View>
          );
        })}
      </View>
      {shown.map((row) => (
        <View key={rowKey(row)} role="row" aria-label={rowLabel?.(row)} style={styles.row}>
          {columns.map((c) => (
            <View key={c.key} role="cell" style={cellStyle(c)}>
              {c.cell(row)}
            </View>
          ))}
        </View>
      ))}
    </View>
  );
}

const cellStyle = <T,>(c: Column<T>) => ({
  flexGrow: c.grow ?? 1,
  flexBasis: 0,
  minWidth: 0,
  paddingHorizontal: space.sm,
  alignItems: c.align === 'right' ? ('flex-end' as const) : ('flex-start' as const),
});

const styles = StyleSheet.create({
  table: { borderWidth: size.borderWidth, borderColor: palette.border, backgroundColor: palette.surface },
  row: {
    flexDirection: 'row',
    alignItems: 'center',
    minHeight: size.touch,
    paddingVertical: space.xs,
    borderBottomWidth: size.borderWidth,
    borderColor: palette.border,
  },
  head: { backgroundColor: palette.surfaceMuted },
  sorter: { minHeight: size.touch, justifyContent: 'center' },
});
