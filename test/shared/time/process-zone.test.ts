// Proves the tz-* vitest projects really run under the machine time zone they claim.
import { describe, expect, it } from 'vitest';

/** getTimezoneOffset() (minutes west of UTC) at local midnight on 2026-01-01 (IANA tz database). */
const EXPECTED: Record<string, number> = { UTC: 0, 'America/New_York': 300, 'Australia/Sydney': -660 };

describe('process time zone', () => {
  it('matches the TZ the test project sets', () => {
    const tz = process.env.TZ;
    const resolved = Intl.DateTimeFormat().resolvedOptions().timeZone;
    const offset = new Date(2026, 0, 1).getTimezoneOffset();
    if (tz && tz in EXPECTED) {
      expect(offset).toBe(EXPECTED[tz]);
      expect(resolved === tz || (tz === 'UTC' && /^(Etc\/)?UTC$/.test(resolved))).toBe(true);
    } else {
      // The plain `unit` project runs in whatever zone the machine has; it must at least be self-consistent.
      expect(Number.isInteger(offset)).toBe(true);
    }
  });
});
