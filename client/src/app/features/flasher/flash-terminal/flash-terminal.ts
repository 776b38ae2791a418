import { ChangeDetectionStrategy, Component, ElementRef, effect, input, output, signal, viewChild } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { encodeSendText, loadSendKeys, saveSendKeys, type SendKey } from '../flasher-record';

/** Bytes the technician sends, with how they are written in the log ("E", "space", "Enter"). */
export interface TypedBytes {
  bytes: Uint8Array;
  shown: string;
}

const SPECIAL_KEYS: Record<string, [number, string]> = {
  Enter: [0x0d, 'Enter'],
  Backspace: [0x08, 'Backspace'],
  Escape: [0x1b, 'Esc'],
};

/** The terminal pane: what the unit prints, a key input that sends each key, and buttons that send configured strings. */
@Component({
  selector: 'rw-flash-terminal',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './flash-terminal.html',
  styleUrl: './flash-terminal.scss',
})
export class FlashTerminal {
  /** Everything shown so far. */
  readonly text = input('');
  /** A port is open and the keys may be sent. */
  readonly connected = input(false);
  readonly typed = output<TypedBytes>();

  protected readonly keys = signal<SendKey[]>(loadSendKeys());
  protected readonly editing = signal(false);
  protected readonly newLabel = signal('');
  protected readonly newText = signal('');
  protected readonly editError = signal('');
  private readonly screen = viewChild<ElementRef<HTMLElement>>('screen');

  constructor() {
    // Keep the newest line in view as the unit prints.
    effect(() => {
      this.text();
      const el = this.screen()?.nativeElement;
      if (el) queueMicrotask(() => (el.scrollTop = el.scrollHeight));
    });
  }

  protected keydown(event: KeyboardEvent): void {
    const special = SPECIAL_KEYS[event.key];
    if (!special || !this.connected()) return;
    event.preventDefault();
    this.typed.emit({ bytes: Uint8Array.of(special[0]), shown: special[1] });
  }

  /** Printable keys arrive through the input event (works with phone keyboards too). */
  protected input(field: HTMLInputElement): void {
    const value = field.value;
    field.value = '';
    if (!value || !this.connected()) return;
    this.typed.emit({ bytes: new TextEncoder().encode(value), shown: value === ' ' ? 'space' : value });
  }

  protected sendKey(key: SendKey): void {
    this.typed.emit({ bytes: encodeSendText(key.text), shown: key.label });
  }

  protected addKey(): void {
    const label = this.newLabel().trim();
    const text = this.newText();
    if (!label || !text) {
      this.editError.set('Give the button a label and the keys it sends.');
      return;
    }
    if (label.length > 40 || text.length > 100) {
      this.editError.set('Keep the label to 40 characters and the keys to 100.');
      return;
    }
    try {
      encodeSendText(text);
    } catch (err) {
      this.editError.set((err as Error).message);
      return;
    }
    this.editError.set('');
    this.keys.update((k) => [...k, { label, text }]);
    saveSendKeys(this.keys());
    this.newLabel.set('');
    this.newText.set('');
  }

  protected removeKey(index: number): void {
    this.keys.update((k) => k.filter((_, i) => i !== index));
    saveSendKeys(this.keys());
  }

  protected shownText(text: string): string {
    return text.replace(/ /g, '␠');
  }
}
