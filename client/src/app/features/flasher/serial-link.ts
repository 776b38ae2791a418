// The one port interface of the Flasher: a real adapter through Web Serial (web-serial-link.ts) and
// the practice unit in a Web Worker (practice-link.ts) both look like this, so the Flasher cannot
// tell them apart.

export type Parity = 'none' | 'even' | 'odd';
export type FlowControl = 'none' | 'hardware';

export interface SerialSettings {
  baudRate: number;
  dataBits: 7 | 8;
  parity: Parity;
  stopBits: 1 | 2;
  flowControl: FlowControl;
}

/** 115200 baud, 8 data bits, no parity, 1 stop bit: the common setting of serial bootloaders (common practice). */
export const DEFAULT_SERIAL_SETTINGS: SerialSettings = { baudRate: 115200, dataBits: 8, parity: 'none', stopBits: 1, flowControl: 'none' };

/** "115200 8N1" */
export function describeSerial(s: SerialSettings): string {
  return `${s.baudRate} ${s.dataBits}${s.parity[0].toUpperCase()}${s.stopBits}${s.flowControl === 'hardware' ? ', RTS/CTS' : ''}`;
}

export interface SerialLink {
  readonly kind: 'web-serial' | 'practice';
  /** What the Flasher shows for the port ("USB serial adapter", "Practice unit (simulated)"). */
  readonly label: string;
  /** Called with every chunk the unit sends. */
  onData: (bytes: Uint8Array) => void;
  /** Called once when the port goes away (unplugged, closed by the browser), with the reason in words. */
  onLost: (reason: string) => void;
  write(bytes: Uint8Array): Promise<void>;
  close(): Promise<void>;
}
