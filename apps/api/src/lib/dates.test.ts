import { afterEach, describe, expect, it } from 'vitest';
import { isTimeZone, serverTimeZone, todayIn } from './dates.js';

const original = process.env.TZ;
afterEach(() => {
  if (original === undefined) delete process.env.TZ;
  else process.env.TZ = original;
});

describe('serverTimeZone', () => {
  it('is read once per TZ and follows a change of TZ at once', () => {
    process.env.TZ = 'America/Chicago';
    expect(serverTimeZone()).toBe('America/Chicago');
    expect(serverTimeZone()).toBe('America/Chicago');
    process.env.TZ = 'Australia/Sydney';
    expect(serverTimeZone()).toBe('Australia/Sydney');
    delete process.env.TZ;
    expect(serverTimeZone()).toBe(Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC');
  });
});

describe('isTimeZone', () => {
  it('knows IANA names and refuses others, the same on every call', () => {
    for (let i = 0; i < 2; i++) {
      expect(isTimeZone('Europe/Berlin')).toBe(true);
      expect(isTimeZone('Mars/Olympus')).toBe(false);
      expect(isTimeZone('')).toBe(false);
    }
  });
  it('reads today on the zone wall clock', () => {
    expect(todayIn('America/Chicago', new Date('2026-06-01T03:30:00Z'))).toBe('2026-05-31');
  });
});
