import type { Config } from './config';

/**
 * Whether a browser's Origin may act on this server: the server's own origin (as
 * the Host header names it), or PUBLIC_URL's. Requests without Origin come from
 * scripts and devices, which carry no ambient cookie of a person's browser.
 */
export function originChecker(config: Config) {
  const publicOrigin = config.PUBLIC_URL ? new URL(config.PUBLIC_URL).origin : null;
  return (origin: string | undefined, host: string | undefined): boolean => {
    if (origin === undefined) return true;
    if (origin === 'null') return false;
    if (publicOrigin && origin === publicOrigin) return true;
    let o: URL;
    try {
      o = new URL(origin);
    } catch {
      return false;
    }
    return host !== undefined && o.host === host.toLowerCase();
  };
}
export type OriginChecker = ReturnType<typeof originChecker>;
