// One way to write a date across the product (screens, reports, e-mails, the audit log): the reader's locale
// through Intl, and the clinic's time zone, so "today", a visit's day and a follow-up date mean the same day for
// everyone in the practice, wherever their device's clock is set.

/** A clinic that has not chosen its zone yet. */
export const FALLBACK_TIME_ZONE = 'UTC';

/**
 * The locale of documents the server writes (reports, e-mails, the audit log): the server does not know its
 * reader's. Screens use the browser's own locale (`undefined`).
 */
export const DOCUMENT_LOCALE = 'en-GB';

export interface DateStyle {
  /** A BCP 47 locale; undefined means the runtime's own (the browser's language on a screen). */
  locale?: string;
  /** An IANA zone name such as "Europe/Lisbon". */
  timeZone: string;
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(locale: string | undefined, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${locale ?? ''}|${JSON.stringify(options)}`;
  let cached = formatters.get(key);
  if (!cached) {
    cached = new Intl.DateTimeFormat(locale, options);
    formatters.set(key, cached);
  }
  return cached;
}

const DAY: Intl.DateTimeFormatOptions = { day: 'numeric', month: 'short', year: 'numeric' };
const CLOCK: Intl.DateTimeFormatOptions = { hour: '2-digit', minute: '2-digit' };

/** True for a zone name this runtime knows (the list a settings form offers). */
export function isTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: zone });
    return zone.length > 0;
  } catch {
    return false;
  }
}

const CALENDAR_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** A calendar date (YYYY-MM-DD) carries no zone: it is the same day wherever it is read. */
function calendarDateAsUtcNoon(ymd: string): Date | null {
  const match = CALENDAR_DATE.exec(ymd);
  if (!match) return null;
  const date = new Date(Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3]), 12));
  return Number.isNaN(date.getTime()) ? null : date;
}

function instant(value: string | Date): Date | null {
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date;
}

/** The calendar date (YYYY-MM-DD) an instant falls on in a zone. */
export function calendarDateIn(value: string | Date, timeZone: string): string {
  const date = instant(value);
  if (!date) return '';
  const parts = formatter('en-CA', {
    timeZone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
  }).formatToParts(date);
  const part = (type: string) => parts.find((p) => p.type === type)?.value ?? '';
  return `${part('year')}-${part('month')}-${part('day')}`;
}

/** Today's calendar date in a zone. */
export const todayIn = (timeZone: string, now: Date = new Date()): string => calendarDateIn(now, timeZone);

/** The calendar date `days` after (or before, when negative) a calendar date. */
export function addDays(ymd: string, days: number): string {
  const date = calendarDateAsUtcNoon(ymd);
  if (!date) return ymd;
  date.setUTCDate(date.getUTCDate() + days);
  return date.toISOString().slice(0, 10);
}

/**
 * A day as the reader writes it ("2 Dec 2026" in en-GB, "Dec 2, 2026" in en-US): from a calendar date as it
 * stands, or from an instant on the day it falls in the clinic's zone.
 */
export function formatDay(value: string | Date | null | undefined, style: DateStyle): string {
  if (value === null || value === undefined || value === '') return '—';
  if (typeof value === 'string') {
    const calendar = calendarDateAsUtcNoon(value);
    if (calendar) return formatter(style.locale, { ...DAY, timeZone: 'UTC' }).format(calendar);
  }
  const date = instant(value);
  return date ? formatter(style.locale, { ...DAY, timeZone: style.timeZone }).format(date) : String(value);
}

/** The clock time of an instant in the clinic's zone ("14:05" or "02:05 PM", as the locale writes it). */
export function formatClock(value: string | Date, style: DateStyle): string {
  const date = instant(value);
  return date ? formatter(style.locale, { ...CLOCK, timeZone: style.timeZone }).format(date) : '';
}

/** When something happened: the day and the clock time in the clinic's zone. */
export function formatMoment(value: string | Date, style: DateStyle): string {
  const date = instant(value);
  if (!date) return String(value);
  return `${formatDay(date, style)}, ${formatClock(date, style)}`;
}
