// How the calculators print their figures: units always, sensible precision (design-language.md).

const grouped = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });

/** 1053697 → "1,053,697". */
export function wholeNumber(value: number): string {
  return grouped.format(value);
}

/** Fixed decimals with a true minus sign. */
export function fixed(value: number, digits: number): string {
  const text = value.toFixed(digits);
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}

/** 91.47 s → "1:31"; 3725 s → "1:02:05". Rounded to the nearest second. */
export function minutesSeconds(seconds: number): string {
  const total = Math.round(seconds);
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = total % 60;
  const ss = String(s).padStart(2, '0');
  return h > 0 ? `${h}:${String(m).padStart(2, '0')}:${ss}` : `${m}:${ss}`;
}

/** Seconds with a precision that suits their size: "0.0232 s", "8.43 s", "91.5 s", "1098 s". */
export function secondsText(seconds: number): string {
  if (seconds < 1) return `${seconds.toPrecision(3)} s`;
  if (seconds < 10) return `${seconds.toFixed(2)} s`;
  if (seconds < 1000) return `${seconds.toFixed(1)} s`;
  return `${seconds.toFixed(0)} s`;
}

/** 1.5 → "1.50:1". */
export function swrText(swr: number): string {
  return `${swr.toFixed(2)}:1`;
}

const PREFIXES: [number, string][] = [
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
];

/**
 * A figure with an SI prefix and 3 significant figures: 5.01e-11 W → "50.1 pW", 70.71 V → "70.7 V",
 * 0.00047 F → "470 µF". Prefixes run from femto to giga; outside that the plain unit in
 * scientific notation.
 */
export function siText(value: number, unit: string, options: { min?: number; max?: number } = {}): string {
  if (value === 0) return `0 ${unit}`;
  const abs = Math.abs(value);
  const [factor, prefix] = PREFIXES.find(([f]) => f <= (options.max ?? 1e9) && abs >= f * 0.9995 && f >= (options.min ?? 1e-15)) ?? [1, ''];
  if (abs / factor >= 999.5 || abs / factor < 0.9995) return `${fixedSign(value.toExponential(2))} ${unit}`;
  return `${fixedSign((value / factor).toPrecision(3))} ${prefix}${unit}`;
}

function fixedSign(text: string): string {
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}

/** S-meter reading: "S9", "S7.3", "S9 + 12 dB", "S0". */
export function sMeterText(reading: { units: number; overS9Db: number }): string {
  if (reading.overS9Db > 0.05) return `S9 + ${reading.overS9Db.toFixed(reading.overS9Db >= 10 ? 0 : 1)} dB`;
  const u = Math.round(reading.units * 10) / 10;
  return `S${Number.isInteger(u) ? u.toFixed(0) : u.toFixed(1)}`;
}

/** Percent with a sign and a true minus: 2.6 → "+2.6 %", −3.62 → "−3.6 %". */
export function signedPercent(value: number, digits = 1): string {
  const text = value.toFixed(digits);
  if (Number(text) === 0) return `0.${'0'.repeat(digits)} %`;
  return value > 0 ? `+${text} %` : `−${text.slice(1)} %`;
}
