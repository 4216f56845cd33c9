import { addDays, calendarDateIn, formatClock, formatDay, formatMoment, isTimeZone, todayIn } from './dates';

// Zone offsets from the IANA time zone database (tzdata): Asia/Tokyo is UTC+9 all year; America/New_York is
// UTC-5 in winter; Europe/Lisbon moves from UTC+0 to UTC+1 at 01:00 UTC on the last Sunday of March (29 Mar 2026).
// Written forms from Unicode CLDR's medium date pattern: en-GB "d MMM y", en-US "MMM d, y".
describe('the calendar date of an instant in the clinic zone (IANA tzdata)', () => {
  const lateEveningInNewYork = '2026-12-02T23:30:00Z';
  it.each([
    ['UTC', '2026-12-02'],
    ['America/New_York', '2026-12-02'],
    ['Asia/Tokyo', '2026-12-03'],
  ])('%s', (zone, day) => expect(calendarDateIn(lateEveningInNewYork, zone)).toBe(day));

  it('follows a change of offset (Lisbon, last Sunday of March)', () => {
    expect(formatClock('2026-03-29T00:30:00Z', { locale: 'en-GB', timeZone: 'Europe/Lisbon' })).toBe('00:30');
    expect(formatClock('2026-03-29T01:30:00Z', { locale: 'en-GB', timeZone: 'Europe/Lisbon' })).toBe('02:30');
  });

  it("gives today's date in the zone, not the device's", () => {
    const now = new Date('2026-12-02T20:00:00Z');
    expect(todayIn('Asia/Tokyo', now)).toBe('2026-12-03');
    expect(todayIn('America/New_York', now)).toBe('2026-12-02');
  });
});

describe('one written form, from the locale (Unicode CLDR medium dates)', () => {
  it('writes a calendar date as it stands, whatever the zone', () => {
    expect(formatDay('2026-03-04', { locale: 'en-GB', timeZone: 'Asia/Tokyo' })).toBe('4 Mar 2026');
    expect(formatDay('2026-03-04', { locale: 'en-US', timeZone: 'America/New_York' })).toBe('Mar 4, 2026');
  });

  it('writes an instant on its day in the clinic zone', () => {
    expect(formatDay('2026-12-02T23:30:00Z', { locale: 'en-GB', timeZone: 'Asia/Tokyo' })).toBe('3 Dec 2026');
    expect(formatMoment('2026-12-02T23:30:00Z', { locale: 'en-GB', timeZone: 'Asia/Tokyo' })).toBe(
      '3 Dec 2026, 08:30',
    );
  });

  it('says so when there is no date', () => {
    expect(formatDay(null, { timeZone: 'UTC' })).toBe('—');
  });
});

describe('calendar arithmetic', () => {
  it('crosses month and leap-year ends (Gregorian calendar)', () => {
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
    expect(addDays('2028-02-28', 1)).toBe('2028-02-29');
    expect(addDays('2027-02-28', 1)).toBe('2027-03-01');
  });
});

describe('zone names', () => {
  it('knows IANA names and refuses others', () => {
    expect(isTimeZone('Europe/Lisbon')).toBe(true);
    expect(isTimeZone('Mars/Olympus')).toBe(false);
    expect(isTimeZone('')).toBe(false);
  });
});
