import { AgePipe, formatAge, hoursSince } from './age';

// Worked examples by hand (our own format, no published source).
describe('formatAge', () => {
  const now = Date.parse('2025-03-10T12:00:00Z');

  it('shows minutes under an hour', () => {
    expect(formatAge('2025-03-10T11:48:00Z', now)).toBe('12 min');
    expect(formatAge('2025-03-10T12:00:00Z', now)).toBe('0 min');
  });

  it('shows whole hours under a day', () => {
    expect(formatAge('2025-03-10T09:00:00Z', now)).toBe('3 h');
    expect(formatAge('2025-03-09T12:00:01Z', now)).toBe('23 h');
  });

  it('shows whole days from a day on', () => {
    expect(formatAge('2025-03-09T12:00:00Z', now)).toBe('1 d');
    expect(formatAge('2025-03-08T06:00:00Z', now)).toBe('2 d');
  });

  it('treats a time in the future as no time and bad input as nothing', () => {
    expect(formatAge('2025-03-10T13:00:00Z', now)).toBe('0 min');
    expect(formatAge(null, now)).toBe('');
    expect(formatAge('not a date', now)).toBe('');
  });

  it('the pipe uses the same format', () => {
    expect(new AgePipe().transform('2025-03-10T09:00:00Z', now)).toBe('3 h');
  });

  it('hoursSince counts fractional hours', () => {
    expect(hoursSince('2025-03-10T10:30:00Z', now)).toBe(1.5);
    expect(hoursSince(null, now)).toBe(0);
  });
});
