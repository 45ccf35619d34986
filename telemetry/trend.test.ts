import { describe, expect, it } from 'vitest';

import { TrendRing } from './trend';

const all = (t: { length: number; at(i: number): unknown }) => Array.from({ length: t.length }, (_, i) => t.at(i));

describe('a live trend in a ring', () => {
  it('keeps the newest points in order, nulls as nulls, and reads from the end with a negative index', () => {
    const r = TrendRing.from(
      [
        { t: 1, v: 1.1 },
        { t: 2, v: null },
      ],
      3,
    );
    let view = r.push(3, 1.3);
    expect(all(view)).toEqual([
      { t: 1, v: 1.1 },
      { t: 2, v: null },
      { t: 3, v: 1.3 },
    ]);
    view = r.push(4, 1.4);
    view = r.push(5, 1.5);
    expect(all(view)).toEqual([
      { t: 3, v: 1.3 },
      { t: 4, v: 1.4 },
      { t: 5, v: 1.5 },
    ]);
    expect(view.at(-1)).toEqual({ t: 5, v: 1.5 });
    expect(view.at(3)).toBeUndefined();
  });

  it('starts from the newest of a longer array and gives a new view at each push', () => {
    const r = TrendRing.from(
      Array.from({ length: 10 }, (_, i) => ({ t: i, v: i })),
      4,
    );
    expect(all(r.view()).map((p) => (p as { t: number }).t)).toEqual([6, 7, 8, 9]);
    expect(r.push(10, 10)).not.toBe(r.push(11, 11));
  });
});
