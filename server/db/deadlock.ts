/**
 * Runs one statement (or one whole transaction) again when InnoDB chose it as the
 * victim of a deadlock. InnoDB rolls the victim back whole, so a second run neither
 * loses nor doubles anything; other errors go straight to the caller.
 */
export async function retryOnDeadlock<T>(run: () => Promise<T>, attempts = 3): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await run();
    } catch (err) {
      if ((err as { code?: string }).code !== 'ER_LOCK_DEADLOCK' || attempt >= attempts) throw err;
    }
  }
}
