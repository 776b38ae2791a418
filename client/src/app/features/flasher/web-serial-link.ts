// A SerialLink over the browser's Web Serial API (Chromium-based browsers, secure contexts only).
// The API reference: WICG "Web Serial API" draft; types from @types/w3c-web-serial.
import type { SerialLink, SerialSettings } from './serial-link';

/** Why flashing through a real adapter is not possible here, or null when it is. */
export function webSerialUnavailableReason(): string | null {
  if (typeof window === 'undefined') return 'There is no browser window.';
  if (!window.isSecureContext) {
    return 'This page was reached over plain HTTP from another computer, and browsers allow serial ports only on secure pages (HTTPS or this computer itself). Open Rigwright over HTTPS, or on the bench laptop itself.';
  }
  if (!('serial' in navigator)) {
    return 'This browser cannot open serial ports. Flashing needs a Chromium-based browser (Chromium, Chrome, Edge); you can still practise on the simulated unit.';
  }
  return null;
}

/** Asks the person to pick the adapter, opens it with the settings and starts reading. */
export async function openWebSerialLink(settings: SerialSettings): Promise<SerialLink> {
  const reason = webSerialUnavailableReason();
  if (reason) throw new Error(reason);
  const port = await navigator.serial.requestPort();
  try {
    await port.open({
      baudRate: settings.baudRate,
      dataBits: settings.dataBits,
      parity: settings.parity,
      stopBits: settings.stopBits,
      flowControl: settings.flowControl,
    });
  } catch (err) {
    throw new Error(`The port could not be opened (${(err as Error).message}). Is another program (a terminal) still holding it?`);
  }
  const writer = port.writable!.getWriter();
  const reader = port.readable!.getReader();
  let closed = false;
  const info = port.getInfo();
  const link: SerialLink = {
    kind: 'web-serial',
    label: info.usbVendorId ? `USB serial adapter ${info.usbVendorId.toString(16).padStart(4, '0')}:${(info.usbProductId ?? 0).toString(16).padStart(4, '0')}` : 'Serial port',
    onData: () => {},
    onLost: () => {},
    async write(bytes) {
      await writer.write(bytes);
    },
    async close() {
      if (closed) return;
      closed = true;
      await reader.cancel().catch(() => {});
      reader.releaseLock();
      writer.releaseLock();
      await port.close().catch(() => {});
    },
  };
  const lost = (why: string) => {
    if (closed) return;
    closed = true;
    link.onLost(why);
  };
  port.addEventListener('disconnect', () => lost('The serial adapter was unplugged.'));
  void (async () => {
    try {
      for (;;) {
        const { value, done } = await reader.read();
        if (done) break;
        if (value) link.onData(value);
      }
    } catch (err) {
      lost(`The port stopped answering: ${(err as Error).message}.`);
    }
  })();
  return link;
}
