/**
 * The bridge requires a token when it listens beyond loopback; it hands the page out as
 * `/?token=…`. The dashboard passes that token on to /ws and /api requests.
 */
export function pageToken(search: string = location.search): string | null {
  const t = new URLSearchParams(search).get('token');
  return t && t.length > 0 ? t : null;
}

/** `url` with the token appended as a query parameter, when there is one. */
export function withToken(url: string, token: string | null): string {
  if (!token) return url;
  return `${url}${url.includes('?') ? '&' : '?'}token=${encodeURIComponent(token)}`;
}
