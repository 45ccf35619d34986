/**
 * Runs one statement (or one whole transaction) again when InnoDB chose it as the
 * victim of a deadlock. InnoDB rolls the victim back whole, so a second run neither
 * loses nor doubles anything; other errors go straight to the caller.
 */
export async function retryOnDeadlock<T>(run: () => Promise<T>, attempts = 4): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await run();
    } catch (err) {
      if ((err as { code?: string }).code !== 'ER_LOCK_DEADLOCK' || attempt >= attempts) throw err;
      // the other transaction usually finishes within milliseconds: wait a little, longer each time,
      // and not in step with whoever else lost
      await new Promise((r) => setTimeout(r, attempt * 5 + Math.random() * 10));
    }
  }
}
