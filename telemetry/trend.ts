/** A tile's trend: anything with a length whose points can be read by index (an array is one). */
export type TrendPoint = { t: number; v: number | null };
export type Trend = { readonly length: number; at(i: number): TrendPoint | undefined };

/**
 * The newest `cap` points of a live trend in two fixed arrays: a reading is one write,
 * with no array copied or grown. Each push gives a new small view (so a tile that
 * compares by identity sees the change) over the same storage; views older than the
 * newest are not to be read, as their oldest slots are reused.
 */
export class TrendRing {
  private readonly ts: Float64Array;
  private readonly vs: Float64Array;
  private start = 0;
  private size = 0;

  constructor(readonly cap: number) {
    this.ts = new Float64Array(cap);
    this.vs = new Float64Array(cap);
  }

  static from(points: Trend, cap: number): TrendRing {
    const r = new TrendRing(cap);
    for (let i = Math.max(0, points.length - cap); i < points.length; i++) {
      const p = points.at(i)!;
      r.write(p.t, p.v);
    }
    return r;
  }

  private write(t: number, v: number | null) {
    const i = (this.start + this.size) % this.cap;
    this.ts[i] = t;
    this.vs[i] = v ?? Number.NaN;
    if (this.size < this.cap) this.size++;
    else this.start = (this.start + 1) % this.cap;
  }

  /** Adds a point and gives the view of the trend with it. */
  push(t: number, v: number | null): Trend {
    this.write(t, v);
    return this.view();
  }

  view(): Trend {
    const { ts, vs, cap, start, size } = this;
    return {
      length: size,
      at(i: number) {
        if (i < 0) i += size;
        if (i < 0 || i >= size) return undefined;
        const k = (start + i) % cap;
        const v = vs[k];
        return { t: ts[k], v: Number.isNaN(v) ? null : v };
      },
    };
  }
}
