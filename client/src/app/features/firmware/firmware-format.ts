// How firmware figures are printed: sizes with units, percentages, the XMODEM plan's time.
const grouped = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });

/** 133120 → "133,120 bytes (130.0 KiB)". */
export function sizeText(bytes: number): string {
  if (bytes < 1024) return `${grouped.format(bytes)} bytes`;
  const kib = bytes / 1024;
  const unit = kib >= 1024 ? `${(kib / 1024).toFixed(2)} MiB` : `${kib.toFixed(1)} KiB`;
  return `${grouped.format(bytes)} bytes (${unit})`;
}

/** 0.5 → "50 %"; null → "not tried yet". */
export function rateText(rate: number | null): string {
  return rate === null ? 'not tried yet' : `${Math.round(rate * 100)} %`;
}

/** Seconds as "1 min 32 s" or "12 s", rounded up: the supply must hold at least this long. */
export function atLeast(seconds: number): string {
  const s = Math.ceil(seconds);
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  const rest = s % 60;
  return rest ? `${m} min ${rest} s` : `${m} min`;
}
