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
