// Preferred resistor values: the E24 series of IEC 60063:2015 ("Preferred number series for
// resistors and capacitors", Table 1; values from memory, they are the ones printed on every
// resistor assortment): 24 values a decade, each about 10 % above the one before.

import { requireFinite } from './input-error';

export const E24 = [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1] as const;

/**
 * The E24 value nearest to `ohms`, nearest by ratio (the series is geometric, so "nearest" means
 * the smallest |log(value / ohms)|). Decade multipliers are applied by exact powers of ten and the
 * result rounded to 3 significant figures, so 4.7 × 10³ is 4700, not 4699.999….
 */
export function nearestE24(ohms: number): number {
  requireFinite('ohms', ohms, { above: 0 });
  const decade = Math.floor(Math.log10(ohms));
  let best = Number.NaN;
  let bestDistance = Number.POSITIVE_INFINITY;
  for (const d of [decade - 1, decade, decade + 1]) {
    for (const mantissa of E24) {
      const candidate = Number((mantissa * 10 ** d).toPrecision(3));
      const distance = Math.abs(Math.log(candidate / ohms));
      if (distance < bestDistance) {
        bestDistance = distance;
        best = candidate;
      }
    }
  }
  return best;
}
