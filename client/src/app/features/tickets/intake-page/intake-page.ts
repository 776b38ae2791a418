import { COMMA, ENTER } from '@angular/cdk/keycodes';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, NonNullableFormBuilder, ReactiveFormsModule, ValidationErrors, Validators } from '@angular/forms';
import { MatAutocompleteModule, MatAutocompleteSelectedEvent } from '@angular/material/autocomplete';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatChipInputEvent, MatChipsModule } from '@angular/material/chips';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { SessionStore } from '../../../core/auth/session-store';
import { Caution } from '../../../shared/caution/caution';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { EQUIPMENT_KINDS, EQUIPMENT_KIND_LABELS, EquipmentKind } from '../../../shared/labels';
import { TicketApi } from '../ticket-api';
import { IntakeBody, TicketDetail } from '../ticket.models';

export const UNIT_SUGGESTIONS = ['display head', 'main body', 'DSP unit'] as const;
export const ACCESSORY_CHOICES = ['control cable', 'DC lead', 'microphone', 'antenna', 'manual'] as const;
const MAX_UNITS = 8;
const FIX_FIELDS = 'Some fields need attention: see the messages below them.';

function maxItems(max: number) {
  return (control: AbstractControl<string[]>): ValidationErrors | null =>
    control.value.length > max ? { maxItems: { max, actual: control.value.length } } : null;
}

/** Hand in equipment: the intake form. Opens a ticket and shows its tag number. */
@Component({
  selector: 'rw-intake-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    Caution,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatCheckboxModule,
    MatChipsModule,
    MatAutocompleteModule,
    MatButtonModule,
    MatIconModule,
    MatCardModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './intake-page.html',
  styleUrl: './intake-page.scss',
})
export class IntakePage {
  private readonly api = inject(TicketApi);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);

  protected readonly kinds = EQUIPMENT_KINDS;
  protected readonly kindLabels = EQUIPMENT_KIND_LABELS;
  protected readonly accessoryChoices = ACCESSORY_CHOICES;
  protected readonly separatorKeys = [ENTER, COMMA] as const;
  protected readonly message = controlMessage;

  protected readonly form = this.fb.group({
    equipmentKind: this.fb.control<EquipmentKind | ''>('', Validators.required),
    makeModel: ['', [Validators.required, Validators.maxLength(120)]],
    serialNumber: ['', [Validators.maxLength(60)]],
    units: this.fb.control<string[]>([], maxItems(MAX_UNITS)),
    faultReported: ['', [Validators.required, Validators.minLength(5), Validators.maxLength(4000)]],
    accessories: this.fb.control<string[]>([]),
    otherAccessory: this.fb.control({ value: '', disabled: true }, [Validators.required, Validators.maxLength(60)]),
    firmwareVersions: ['', [Validators.maxLength(500)]],
    reflashConsent: [false],
    notifyByEmail: [true],
    onBehalf: [false],
    owner: this.fb.group({
      name: ['', [Validators.required, Validators.maxLength(100)]],
      email: ['', [Validators.required, Validators.email, Validators.maxLength(254)]],
      phone: ['', [Validators.maxLength(40)]],
      callSign: ['', [Validators.maxLength(12)]],
    }),
  });

  /** Technicians and admins may hand in for an owner who is not signed in (or has no account). */
  protected readonly mayActForOwner = computed(() => this.session.hasAnyRole('technician', 'admin'));
  protected readonly otherTicked = signal(false);
  protected readonly unitText = signal('');
  private readonly units = toSignal(this.form.controls.units.valueChanges, { initialValue: [] as string[] });
  protected readonly unitSuggestions = computed(() => {
    const chosen = this.units();
    const text = this.unitText().toLowerCase();
    return UNIT_SUGGESTIONS.filter((u) => !chosen.includes(u) && u.includes(text));
  });

  private readonly submitter = new FormSubmitter(this.form, {
    invalidMessage: FIX_FIELDS,
    errorMessage: (apiError) => placeServerError(this.form, apiError) || FIX_FIELDS,
  });
  protected readonly busy = this.submitter.busy;
  protected readonly formError = this.submitter.formError;
  protected readonly opened = signal<TicketDetail | null>(null);

  constructor() {
    this.form.controls.owner.disable();
    // The summary above the form goes away once every field is fixed.
    this.form.statusChanges.pipe(takeUntilDestroyed()).subscribe((status) => {
      if (status === 'VALID' && this.formError() === FIX_FIELDS) this.formError.set('');
    });
    this.form.controls.onBehalf.valueChanges.pipe(takeUntilDestroyed()).subscribe((on) => {
      if (on) this.form.controls.owner.enable();
      else this.form.controls.owner.disable();
    });
  }

  protected unitList(): string[] {
    return this.form.controls.units.value;
  }

  protected addUnit(event: MatChipInputEvent): void {
    this.pushUnit(event.value);
    event.chipInput.clear();
    this.unitText.set('');
  }

  protected pickUnit(event: MatAutocompleteSelectedEvent, input: HTMLInputElement): void {
    this.pushUnit(event.option.viewValue);
    input.value = '';
    this.unitText.set('');
    event.option.deselect();
  }

  protected removeUnit(unit: string): void {
    const units = this.form.controls.units;
    units.setValue(units.value.filter((u) => u !== unit));
    units.markAsDirty();
  }

  private pushUnit(raw: string): void {
    const unit = raw.trim().slice(0, 60);
    const units = this.form.controls.units;
    if (!unit || units.value.includes(unit)) return;
    units.setValue([...units.value, unit]);
    units.markAsTouched();
  }

  protected hasAccessory(name: string): boolean {
    return this.form.controls.accessories.value.includes(name);
  }

  protected toggleAccessory(name: string, checked: boolean): void {
    const control = this.form.controls.accessories;
    const rest = control.value.filter((a) => a !== name);
    control.setValue(checked ? [...rest, name] : rest);
  }

  protected toggleOther(checked: boolean): void {
    this.otherTicked.set(checked);
    const other = this.form.controls.otherAccessory;
    if (checked) other.enable();
    else other.disable();
  }

  protected submit(): void {
    this.submitter.submit(
      () => this.api.create(this.body()),
      (ticket) => this.opened.set(ticket),
    );
  }

  /** The request body: trimmed text, optional fields left out when empty. */
  private body(): IntakeBody {
    const v = this.form.getRawValue();
    const accessories = [...v.accessories];
    if (this.otherTicked() && v.otherAccessory.trim()) accessories.push(v.otherAccessory.trim());
    const body: IntakeBody = {
      equipmentKind: v.equipmentKind as EquipmentKind,
      makeModel: v.makeModel.trim(),
      units: v.units,
      faultReported: v.faultReported.trim(),
      accessories,
      reflashConsent: v.reflashConsent,
      notifyByEmail: v.notifyByEmail,
    };
    if (v.serialNumber.trim()) body.serialNumber = v.serialNumber.trim();
    if (v.firmwareVersions.trim()) body.firmwareVersions = v.firmwareVersions.trim();
    if (this.mayActForOwner() && v.onBehalf) {
      const o = v.owner;
      body.owner = {
        name: o.name.trim(),
        email: o.email.trim(),
        ...(o.phone.trim() ? { phone: o.phone.trim() } : {}),
        ...(o.callSign.trim() ? { callSign: o.callSign.trim().toUpperCase() } : {}),
      };
    }
    return body;
  }

  protected startAnother(): void {
    this.opened.set(null);
    this.form.reset();
    this.toggleOther(false);
    this.form.controls.owner.disable();
  }
}
