// Which links may leave the app for the system browser: https only, to a short allow-list
// of hosts the app itself links to (the delay data's publisher, the time-zone database).
export const EXTERNAL_HOSTS: readonly string[] = ['www.transtats.bts.gov', 'www.bts.gov', 'www.iana.org'];

export function isAllowedExternal(url: string): boolean {
  try {
    const u = new URL(url);
    return u.protocol === 'https:' && u.username === '' && u.password === '' && u.port === '' && EXTERNAL_HOSTS.includes(u.hostname);
  } catch {
    return false;
  }
}
