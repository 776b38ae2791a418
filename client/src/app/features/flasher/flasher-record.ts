// The Flasher's bookkeeping, kept apart from the page so it can be tested on its own: which images
// may be offered, the image check (SHA-256 in the browser), the run kept in localStorage while it
// goes (so a reload loses nothing), and the flash attempt a run becomes.
import type { FirmwareUnit, FlashOutcome as AttemptOutcome, TrackRecordRow } from '@contracts/firmware';
import type { AttemptFields } from '../firmware/firmware.models';
import type { FlashOutcome, FlashProgress } from './flash-run';
import type { SerialSettings } from './serial-link';

/** Images the Flasher may offer: the library's images for the model and unit, never a withdrawn one. */
export function offerableImages(rows: readonly TrackRecordRow[]): TrackRecordRow[] {
  return rows.filter((r) => !r.withdrawn);
}

/** The ticket's units in its own words → the library's unit ("display head" → display_head). */
export function libraryUnitOf(text: string): FirmwareUnit {
  const t = text.toLowerCase();
  if (/\bdsp\b|signal processor/.test(t)) return 'dsp';
  if (/display|head|front panel|control panel/.test(t)) return 'display_head';
  if (/main|body|board|rf|radio/.test(t)) return 'main_board';
  return 'other';
}

export interface UnitChoice {
  unit: FirmwareUnit;
  /** The ticket's own words for it, when the ticket names it. */
  ticketWords: string | null;
}

/** The units to offer for a ticket: the ones it names first (in its words), then the rest of the library's units. */
export function unitChoices(ticketUnits: readonly string[], all: readonly FirmwareUnit[]): UnitChoice[] {
  const named = new Map<FirmwareUnit, string>();
  for (const words of ticketUnits) {
    const unit = libraryUnitOf(words);
    named.set(unit, named.has(unit) ? `${named.get(unit)}, ${words}` : words);
  }
  return [
    ...[...named].map(([unit, words]) => ({ unit, ticketWords: words })),
    ...all.filter((u) => !named.has(u)).map((unit) => ({ unit, ticketWords: null })),
  ];
}

export const NO_SUBTLE_CRYPTO =
  'This page cannot check the image: browsers allow SubtleCrypto (SHA-256) only on secure pages (HTTPS, or Rigwright opened on this computer itself).';

/** SHA-256 of the bytes in lower-case hex, with the browser's SubtleCrypto (secure contexts only). */
export async function sha256Hex(bytes: ArrayBuffer | Uint8Array): Promise<string> {
  if (!globalThis.crypto?.subtle) throw new Error(NO_SUBTLE_CRYPTO);
  const digest = await crypto.subtle.digest('SHA-256', bytes as BufferSource);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/**
 * ok: the bytes match the library; mismatch: they do not, and the Flasher stops; unchecked: the page
 * is not a secure context, so only the practice unit (which checks the CRC itself) may be used.
 */
export type ImageCheck = { ok: true; sha256: string } | { ok: false; sha256: string; message: string } | { ok: 'unchecked'; message: string };

/** Compares the fetched bytes with the library's SHA-256 and size; a mismatch stops the Flasher. */
export async function checkImage(bytes: Uint8Array, library: { sha256: string; size: number; version: string }): Promise<ImageCheck> {
  if (!globalThis.crypto?.subtle) return { ok: 'unchecked', message: `${NO_SUBTLE_CRYPTO} Only the practice unit can be used here.` };
  const sha256 = await sha256Hex(bytes);
  if (sha256 !== library.sha256.toLowerCase() || bytes.length !== library.size) {
    return {
      ok: false,
      sha256,
      message:
        `The image ${library.version} that arrived does not match the library: SHA-256 ${sha256.slice(0, 12)}… (${bytes.length} bytes), ` +
        `the library has ${library.sha256.slice(0, 12)}… (${library.size} bytes). Nothing was sent to the unit. ` +
        'Reload the page to fetch it again; if it still differs, tell an admin: the stored file may be damaged.',
    };
  }
  return { ok: true, sha256 };
}

/** A run as kept in localStorage while it goes, and after it ended until it is saved. */
export interface PendingRun {
  v: 1;
  tag: string;
  unit: FirmwareUnit;
  firmwareId: number;
  imageVersion: string;
  blocks: number;
  port: string;
  settings: SerialSettings;
  block: 128 | 1024;
  check: 'crc' | 'sum';
  startedAt: string;
  elapsedMs: number;
  acknowledged: number;
  phase: FlashProgress['phase'];
  retries: { block: number; text: string }[];
  outcome: FlashOutcome | null;
  /** Plan seconds for the whole image at the chosen baud (for the notes). */
  planSeconds: number;
  log: string;
}

export const PENDING_RUN_KEY = 'rw.flasher.unsavedRun';

export function loadPendingRun(storage: Storage = localStorage): PendingRun | null {
  try {
    const raw = storage.getItem(PENDING_RUN_KEY);
    if (!raw) return null;
    const p = JSON.parse(raw) as PendingRun;
    return p && p.v === 1 && typeof p.tag === 'string' && typeof p.firmwareId === 'number' ? p : null;
  } catch {
    return null;
  }
}

export function keepPendingRun(run: PendingRun, storage: Storage = localStorage): void {
  try {
    storage.setItem(PENDING_RUN_KEY, JSON.stringify(run));
  } catch {
    // Storage full or refused (private window): the run is still saved at its end.
  }
}

export function forgetPendingRun(storage: Storage = localStorage): void {
  storage.removeItem(PENDING_RUN_KEY);
}

/** The outcome of a run, or, for a run the page lost (reload, closed tab), the outcome so far. */
export function outcomeOf(p: PendingRun): FlashOutcome {
  if (p.outcome) return p.outcome;
  const reason = 'The page was reloaded or closed during the run; the transfer stopped there.';
  if (p.phase === 'waiting' && p.acknowledged === 0) return { kind: 'bootloader_not_entered', block: 0, reason };
  return { kind: 'transfer_failed', block: Math.max(1, Math.min(p.acknowledged + 1, p.blocks)), reason };
}

/** The serial log may hold at most this much (the API's default limit is 256 KiB). */
export const SERIAL_LOG_MAX_BYTES = 250_000;

/** Text a serial log may hold: no NUL or other control bytes besides tab, line feed and carriage return. */
export function cleanLog(text: string): string {
  // eslint-disable-next-line no-control-regex
  const clean = text.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g, '');
  const bytes = new TextEncoder().encode(clean);
  if (bytes.length <= SERIAL_LOG_MAX_BYTES) return clean;
  // Keep the start (the banner and the commands) and the end (how it finished).
  const dec = new TextDecoder();
  const head = dec.decode(bytes.subarray(0, 40_000)).replace(/\uFFFD$/, '');
  const tail = dec.decode(bytes.subarray(bytes.length - (SERIAL_LOG_MAX_BYTES - 41_000))).replace(/^\uFFFD/, '');
  return `${head}\n[... ${bytes.length - SERIAL_LOG_MAX_BYTES + 1000} bytes of the log left out ...]\n${tail}`;
}

const NOTES_MAX = 4000;

/** Fields of the flash attempt a run becomes, and its serial log as a text file. */
export function attemptOf(p: PendingRun): { fields: AttemptFields; log: File; outcome: AttemptOutcome } {
  const outcome = outcomeOf(p);
  const s = p.settings;
  const seconds = (p.elapsedMs / 1000).toFixed(1);
  const retries = p.retries.length
    ? `${p.retries.length} ${p.retries.length === 1 ? 'retry' : 'retries'} (${p.retries
        .slice(0, 20)
        .map((r) => `block ${r.block}: ${r.text}`)
        .join('; ')}${p.retries.length > 20 ? '; …' : ''})`
    : 'no retries';
  let notes =
    `Flasher run on ${p.port}: ${outcome.reason} ${retries}. Took ${seconds} s; the plan gives ${p.planSeconds.toFixed(1)} s at ${s.baudRate} baud. ` +
    `Flow control: ${s.flowControl === 'hardware' ? 'hardware (RTS/CTS)' : 'none'}.`;
  if (notes.length > NOTES_MAX) notes = `${notes.slice(0, NOTES_MAX - 1)}…`;
  const fields: AttemptFields = {
    unit: p.unit,
    firmwareId: p.firmwareId,
    port: p.port.slice(0, 60),
    baud: s.baudRate,
    dataBits: s.dataBits,
    parity: s.parity,
    stopBits: String(s.stopBits) as '1' | '2',
    block: p.block,
    check: p.check,
    outcome: outcome.kind,
    ...(outcome.kind === 'transfer_failed' ? { failedAtBlock: outcome.block } : {}),
    notes,
  };
  const stamp = p.startedAt.replace(/[:.]/g, '-');
  const text = cleanLog(p.log) || '(the unit printed nothing)\n';
  return { fields, log: new File([text], `${p.tag}-flasher-${stamp}.txt`, { type: 'text/plain' }), outcome: outcome.kind };
}

/** A button that sends a configured string to the unit (e.g. a bootloader's menu key). */
export interface SendKey {
  label: string;
  /** What is sent, with \r, \n, \t and \xHH escapes. */
  text: string;
}

export const SEND_KEYS_KEY = 'rw.flasher.sendKeys';

/** The practice unit's loader keys; a real bootloader's keys are set per bench in the same list. */
export const DEFAULT_SEND_KEYS: SendKey[] = [
  { label: 'Stop in loader (space)', text: ' ' },
  { label: 'Erase (E)', text: 'E' },
  { label: 'Receive (R)', text: 'R' },
  { label: 'Boot (B)', text: 'B' },
];

export function loadSendKeys(storage: Storage = localStorage): SendKey[] {
  try {
    const raw = storage.getItem(SEND_KEYS_KEY);
    const keys = raw ? (JSON.parse(raw) as SendKey[]) : null;
    if (Array.isArray(keys) && keys.every((k) => typeof k?.label === 'string' && typeof k?.text === 'string')) return keys;
  } catch {
    // fall through to the defaults
  }
  return DEFAULT_SEND_KEYS.map((k) => ({ ...k }));
}

export function saveSendKeys(keys: SendKey[], storage: Storage = localStorage): void {
  storage.setItem(SEND_KEYS_KEY, JSON.stringify(keys));
}

/** "E\r" → bytes 0x45 0x0D; "\x1b" → 0x1B. Throws with a plain message on a bad escape. */
export function encodeSendText(text: string): Uint8Array {
  const out: number[] = [];
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c !== '\\') {
      out.push(...new TextEncoder().encode(c));
      continue;
    }
    const next = text[++i];
    if (next === 'r') out.push(0x0d);
    else if (next === 'n') out.push(0x0a);
    else if (next === 't') out.push(0x09);
    else if (next === '\\') out.push(0x5c);
    else if (next === 'x' && /^[0-9a-fA-F]{2}$/.test(text.slice(i + 1, i + 3))) {
      out.push(parseInt(text.slice(i + 1, i + 3), 16));
      i += 2;
    } else throw new Error(`“\\${next ?? ''}” is not an escape the Flasher knows: use \\r, \\n, \\t, \\\\ or \\xHH.`);
  }
  return Uint8Array.from(out);
}

/** What the terminal shows for bytes from the unit: text as it is, other bytes as a middle dot. */
export function terminalText(bytes: Uint8Array): string {
  let s = '';
  for (const b of bytes) {
    if (b === 0x0a || b === 0x09 || (b >= 0x20 && b < 0x7f)) s += String.fromCharCode(b);
    else if (b === 0x0d) continue;
    else if (b >= 0x80) s += '·';
    // other control bytes (the protocol's ACK, NAK, ...) are not shown
  }
  return s;
}
