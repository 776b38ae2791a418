import { Pipe, PipeTransform } from '@angular/core';

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

/**
 * How long since `since`, short enough for a card: "12 min", "3 h", "2 d".
 * Under an hour in minutes, under a day in whole hours, then whole days (rounded down).
 */
export function formatAge(since: string | Date | null | undefined, now: number = Date.now()): string {
  if (since === null || since === undefined || since === '') return '';
  const start = typeof since === 'string' ? Date.parse(since) : since.getTime();
  if (Number.isNaN(start)) return '';
  const elapsed = Math.max(0, now - start);
  if (elapsed < HOUR) return `${Math.floor(elapsed / MINUTE)} min`;
  if (elapsed < DAY) return `${Math.floor(elapsed / HOUR)} h`;
  return `${Math.floor(elapsed / DAY)} d`;
}

/** Hours since `since` (fractional), for comparing with the club's wait limit. */
export function hoursSince(since: string | null | undefined, now: number = Date.now()): number {
  if (!since) return 0;
  const start = Date.parse(since);
  return Number.isNaN(start) ? 0 : Math.max(0, now - start) / HOUR;
}

/** `{{ card.stateSince | age: now() }}`: pass a ticking `now` so the age updates. */
@Pipe({ name: 'age' })
export class AgePipe implements PipeTransform {
  transform(since: string | Date | null | undefined, now?: number): string {
    return formatAge(since, now ?? Date.now());
  }
}
