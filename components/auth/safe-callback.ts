/** Keeps a callback URL on this site (a path), so a crafted link cannot send someone elsewhere after sign-in. */
export function safeCallbackUrl(raw: string | null | undefined, fallback = '/teams'): string {
  if (!raw) return fallback;
  if (raw.startsWith('/') && !raw.startsWith('//') && !raw.startsWith('/\\')) return raw;
  try {
    const u = new URL(raw);
    if (typeof window !== 'undefined' && u.origin === window.location.origin) return `${u.pathname}${u.search}${u.hash}`;
  } catch {
    return fallback;
  }
  return fallback;
}
