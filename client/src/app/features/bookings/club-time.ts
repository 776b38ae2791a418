// Instants from the API are UTC; the club reads them in its own time zone (a club setting), which
// need not be the browser's. Intl does the conversion from the browser's IANA data.

/** "19:00" in the club's zone. */
export function clubTime(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(iso));
}

/** "Tue 2 Jun 2026" in the club's zone. */
export function clubDate(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'short', day: 'numeric', month: 'short', year: 'numeric' }).format(new Date(iso));
}

/** "Tue 2 Jun 2026, 19:00–20:00" in the club's zone. */
export function clubSpan(startIso: string, endIso: string, timeZone: string): string {
  return `${clubDate(startIso, timeZone)}, ${clubTime(startIso, timeZone)}–${clubTime(endIso, timeZone)}`;
}

/** The calendar date a datepicker gave (its own year, month and day), as 'YYYY-MM-DD'. */
export function isoDate(date: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}`;
}

/** Today's date in the club's zone, as a Date at local midnight (what a datepicker holds). */
export function clubToday(timeZone: string, now = new Date()): Date {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(now);
  const [y, m, d] = parts.split('-').map(Number);
  return new Date(y!, m! - 1, d!);
}
