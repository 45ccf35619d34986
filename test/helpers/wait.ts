/** Polls until the check returns a truthy value, or fails after the timeout. */
export async function until<T>(
  check: () => Promise<T> | T,
  what: string | (() => string),
  timeoutMs = 10_000,
): Promise<NonNullable<T>> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await check();
    if (v) return v as NonNullable<T>;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${typeof what === 'function' ? what() : what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
