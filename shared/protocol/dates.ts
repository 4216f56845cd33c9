import { z } from 'zod';

// PostgreSQL has no year 0 (1 BC is followed by AD 1), so such a value would fail in the database, not here.
const notYearZero = (value: string) => !value.startsWith('0000');

/**
 * Every date the API accepts, as YYYY-MM-DD. zod's ISO date knows month lengths and leap years, so
 * 2026-02-31 and 2026-13-45 are refused here instead of reaching the database.
 */
export const calendarDateSchema = z.iso
  .date({ error: 'Use a real date written like 2026-03-31.' })
  .refine(notYearZero, { error: 'Use a real date written like 2026-03-31.' });

/** Every point in time the API accepts: ISO 8601 with a calendar-checked date and an offset. */
export const instantSchema = z.iso
  .datetime({ offset: true, error: 'Use a time written like 2026-03-31T14:05:00Z.' })
  .refine(notYearZero, { error: 'Use a time written like 2026-03-31T14:05:00Z.' });

/** For forms that check a date before it is sent: the same rule as the API's. */
export const isCalendarDate = (value: string) => calendarDateSchema.safeParse(value).success;
