import fs from 'node:fs';
import path from 'node:path';

import { SMTPServer } from 'smtp-server';

/**
 * A local SMTP catcher for development and tests: accepts every message on
 * loopback, keeps it in memory and writes it as an .eml file to the dev outbox.
 */
export type Caught = { from: string; to: string[]; raw: string; at: Date };

export async function startCatcher(opts: { port: number; dir?: string }) {
  const messages: Caught[] = [];
  if (opts.dir) fs.mkdirSync(opts.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 5 * 1024 * 1024,
    onData(stream, session, done) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const m: Caught = {
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map((r) => r.address),
          raw,
          at: new Date(),
        };
        messages.push(m);
        if (messages.length > 1000) messages.shift();
        if (opts.dir)
          fs.writeFileSync(
            path.join(opts.dir, `${m.at.toISOString().replace(/[:.]/g, '-')}-${messages.length}.eml`),
            raw,
          );
        done();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  return {
    port: typeof address === 'object' && address ? address.port : opts.port,
    messages,
    close: () => new Promise<void>((r) => server.close(() => r())),
  };
}
export type Catcher = Awaited<ReturnType<typeof startCatcher>>;
