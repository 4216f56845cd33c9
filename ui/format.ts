import {
  FALLBACK_TIME_ZONE,
  formatClock,
  formatDay,
  formatMoment,
  type DateStyle,
} from '@/shared/format/dates';

// Screens write dates in the browser's locale and the signed-in clinic's time zone (set on sign-in from the
// user's clinic; the device's own zone until then). One module-level setting, because dates are written deep in
// table cells and labels that have no React context of their own.
const deviceZone = (() => {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone || FALLBACK_TIME_ZONE;
  } catch {
    return FALLBACK_TIME_ZONE;
  }
})();

let displayStyle: DateStyle = { timeZone: deviceZone };

/** Called by the sign-in state when the clinic (and so its zone) is known or forgotten. */
export function setDisplayTimeZone(timeZone: string | null): void {
  displayStyle = { timeZone: timeZone ?? deviceZone };
}

export const displayTimeZone = (): string => displayStyle.timeZone;

/** A day: a calendar date as it stands, or the day an instant falls on in the clinic's zone. */
export const formatDate = (value: string | null | undefined): string => formatDay(value, displayStyle);

/** The clock time of an instant, in the clinic's zone. */
export const formatTime = (iso: string): string => formatClock(iso, displayStyle);

/** When something happened: day and clock time, in the clinic's zone. */
export const formatDateTime = (iso: string): string => formatMoment(iso, displayStyle);
