/** Only same-app paths, so a crafted link cannot send the user elsewhere after sign-in. */
export function safeReturnUrl(url: string | null): string {
  if (!url || !url.startsWith('/') || url.startsWith('//') || url.startsWith('/sign-')) return '/songs';
  return url;
}
