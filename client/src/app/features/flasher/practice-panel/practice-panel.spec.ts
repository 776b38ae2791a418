// The practice session built from the panel's faults.
import { crc16XmodemUpdate } from '@domain/crc16-xmodem';
import { NO_FAULTS, practiceSessionOptions } from './practice-panel';

describe('practiceSessionOptions', () => {
  const bytes = new TextEncoder().encode('123456789');

  it('no faults: the unit runs at the port’s baud and expects the checked image', () => {
    const o = practiceSessionOptions(NO_FAULTS, 115200, { bytes, version: '2.40' });
    expect(o.hostBaud).toBe(115200);
    expect(o.unitBaud).toBe(115200);
    // CRC-16/XMODEM check value of "123456789" is 0x31C3 (CRC RevEng catalogue).
    expect(crc16XmodemUpdate(bytes)).toBe(0x31c3);
    expect(o.unit.expected).toEqual({ length: 9, crc16: 0x31c3, version: '2.40' });
    expect(o.unit.faults).toEqual({ missBootWindow: false });
  });

  it('faults set on the panel reach the unit; a wrong baud runs the unit at another rate than the port', () => {
    const o = practiceSessionOptions(
      { bitErrorRate: 1e-5, dropByteAt: 300, powerDipAtBlock: 4, missBootWindow: true, wrongBaud: true },
      115200,
      { bytes, version: '2.40' },
    );
    expect(o.unitBaud).toBe(57600);
    expect(o.unit.faults).toEqual({ bitErrorRate: 1e-5, dropByteAt: 300, powerDipAtBlock: 4, missBootWindow: true });
    expect(practiceSessionOptions({ ...NO_FAULTS, wrongBaud: true }, 9600, { bytes, version: '2.40' }).unitBaud).toBe(115200);
  });
});
