import { describe, expect, it } from 'vitest';

import { newControllerPassword } from './controllers';

describe('a controller password', () => {
  it('is 24 URL-safe characters and never starts with a dash, which command lines read as an option', () => {
    // 10,000 draws: with a dash allowed first, about 156 of them would start with one
    const drawn = Array.from({ length: 10_000 }, newControllerPassword);
    for (const p of drawn) expect(p).toMatch(/^[A-Za-z0-9_][A-Za-z0-9_-]{23}$/);
    expect(new Set(drawn).size).toBe(drawn.length);
  });
});
