import { crc16XmodemUpdate } from '@domain/crc16-xmodem';
import { ChangeDetectionStrategy, Component, input, model, output } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { PracticeSessionOptions } from '../practice-session';

/** The faults a volunteer can set on the practice unit before powering it on. */
export interface PracticeFaultsForm {
  bitErrorRate: number;
  dropByteAt: number | null;
  powerDipAtBlock: number | null;
  missBootWindow: boolean;
  wrongBaud: boolean;
}

export const NO_FAULTS: PracticeFaultsForm = { bitErrorRate: 0, dropByteAt: null, powerDipAtBlock: null, missBootWindow: false, wrongBaud: false };

/**
 * Line noise levels offered. At 115200 8N1 a 1029-byte block carries 8232 data bits, so a bit-error
 * rate of 1e-6 hits about 1 block in 120 and 1e-5 about 1 in 12 (1 − (1 − p)^8232; worked by hand).
 */
export const BIT_ERROR_RATES = [
  { value: 0, label: 'None' },
  { value: 1e-6, label: '1 in a million bits' },
  { value: 1e-5, label: '1 in 100,000 bits' },
  { value: 1e-4, label: '1 in 10,000 bits' },
];

/**
 * The practice session for the faults set on the panel: the unit expects the checked image (length,
 * CRC-16/XMODEM, version); "wrong baud" runs the unit at another rate than the port.
 */
export function practiceSessionOptions(f: PracticeFaultsForm, baud: number, image: { bytes: Uint8Array; version: string }): PracticeSessionOptions {
  return {
    hostBaud: baud,
    unitBaud: f.wrongBaud ? (baud === 115200 ? 57600 : 115200) : baud,
    unit: {
      installedVersion: 'old (damaged)',
      expected: { length: image.bytes.length, crc16: crc16XmodemUpdate(image.bytes), version: image.version },
      faults: {
        ...(f.bitErrorRate ? { bitErrorRate: f.bitErrorRate } : {}),
        ...(f.dropByteAt !== null ? { dropByteAt: f.dropByteAt } : {}),
        ...(f.powerDipAtBlock !== null ? { powerDipAtBlock: f.powerDipAtBlock } : {}),
        missBootWindow: f.missBootWindow,
      },
    },
  };
}

/** The practice unit's panel: clearly a simulation, with the faults it can play. */
@Component({
  selector: 'rw-practice-panel',
  imports: [FormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './practice-panel.html',
  styleUrl: './practice-panel.scss',
})
export class PracticePanel {
  readonly faults = model.required<PracticeFaultsForm>();
  /** The practice unit is powered (its port is open). */
  readonly powered = input(false);
  /** What the simulation last reported (a supply dip, the image it checked). */
  readonly report = input('');
  readonly powerCycle = output<void>();

  protected readonly rates = BIT_ERROR_RATES;

  protected set<K extends keyof PracticeFaultsForm>(key: K, value: PracticeFaultsForm[K]): void {
    this.faults.update((f) => ({ ...f, [key]: value }));
  }

  protected wholeOrNull(value: unknown): number | null {
    const n = Number(value);
    return value === '' || value === null || !Number.isInteger(n) || n < 0 ? null : n;
  }
}
