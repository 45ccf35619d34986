/** The session token a sign-in answer set as its HttpOnly cookie (the body carries none). */
export function sessionFromSetCookie(setCookie: string[] | string | undefined): string {
  const all = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : [];
  const m = all.map((c) => /^thawline_session=([^;]+)/.exec(c)).find(Boolean);
  if (!m) throw new Error('the sign-in set no session cookie');
  return m[1];
}
