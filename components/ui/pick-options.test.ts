import { describe, expect, it } from 'vitest';

import { pickOptions } from './pick-options';

const sites = [
  'Kettle Pike (KTP)',
  'Brindle Crag (BRC)',
  'Oxlöw Summit (OXS)',
  'Sable Fen (SBF)',
  'Corvid Bluff (CVB)',
].map((label, i) => ({ value: i + 1, label }));

describe('a searchable site picker', () => {
  it('finds by any words of the name or the code, ignoring case and accents', () => {
    expect(pickOptions(sites, 'oxlow', null).shown.map((o) => o.value)).toEqual([3]);
    expect(pickOptions(sites, 'sbf', null).shown.map((o) => o.value)).toEqual([4]);
    expect(pickOptions(sites, 'crag bri', null).shown.map((o) => o.value)).toEqual([2]);
    expect(pickOptions(sites, 'nowhere', null)).toEqual({ shown: [], matching: 0 });
  });

  it('shows at most a handful, says how many match, and never hides the one chosen', () => {
    const r = pickOptions(sites, '', 5, 2);
    expect(r.matching).toBe(5);
    expect(r.shown.map((o) => o.value)).toEqual([5, 1, 2]);
    expect(pickOptions(sites, 'kettle', 4).shown.map((o) => o.value)).toEqual([4, 1]);
  });
});
