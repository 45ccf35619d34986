import fs from 'node:fs/promises';
import path from 'node:path';

import { simpleParser } from 'mailparser';

export type CaughtMessage = {
  id: string;
  at: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
};

/**
 * What the development SMTP catcher caught, newest first, read from the .eml files
 * it leaves in `dir`: who to, subject, time, text and HTML as a person would see them.
 */
export async function readCaughtMail(dir: string, limit = 100): Promise<CaughtMessage[]> {
  let names: string[];
  try {
    names = (await fs.readdir(dir)).filter((n) => n.endsWith('.eml'));
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw e;
  }
  const newest = (await Promise.all(names.map(async (n) => ({ n, at: (await fs.stat(path.join(dir, n))).mtimeMs }))))
    .sort((a, b) => b.at - a.at || b.n.localeCompare(a.n))
    .slice(0, limit);
  return Promise.all(
    newest.map(async ({ n, at }) => {
      const m = await simpleParser(await fs.readFile(path.join(dir, n)));
      const addresses = (v: typeof m.to) =>
        v ? (Array.isArray(v) ? v : [v]).flatMap((a) => a.value.map((x) => x.address ?? '')) : [];
      return {
        id: n.replace(/\.eml$/, ''),
        at: (m.date ?? new Date(at)).toISOString(),
        from: m.from?.text ?? '',
        to: addresses(m.to),
        subject: m.subject ?? '',
        text: m.text ?? '',
        html: typeof m.html === 'string' ? m.html : null,
      };
    }),
  );
}
