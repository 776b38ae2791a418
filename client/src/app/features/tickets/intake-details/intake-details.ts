import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { AbstractControl, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { COMMON_ACCESSORIES, SYMPTOMS, SYMPTOM_LABELS } from '@contracts/tickets';
import { SessionStore } from '../../../core/auth/session-store';
import { readApiError } from '../../../core/http/api-error';
import { Notifier } from '../../../core/notifier';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { EQUIPMENT_KINDS, EQUIPMENT_KIND_LABELS, EquipmentKind } from '../../../shared/labels';
import { someTicked } from '../intake-page/intake-rules';
import { TicketApi } from '../ticket-api';
import { IntakeEditBody, Symptom, TicketDetail, UpdateChannel } from '../ticket.models';
import { TicketPhotos } from '../ticket-photos/ticket-photos';

const COMMON: readonly string[] = COMMON_ACCESSORIES;
const UPDATE_WORDS: Record<UpdateChannel, string> = { email: 'By e-mail', phone: 'By phone', none: 'None' };

/** "a, b , ,c" → ["a", "b", "c"] */
function splitList(text: string): string[] {
  return [...new Set(text.split(',').map((s) => s.trim()).filter(Boolean))];
}

/**
 * The ticket page's intake section: what was reported and handed in, the printable intake tag, the
 * condition photos, and (for technicians) the edit form; each saved edit is an event on the timeline.
 */
@Component({
  selector: 'rw-intake-details',
  imports: [
    ReactiveFormsModule,
    TicketPhotos,
    MatCardModule,
    MatButtonModule,
    MatIconModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatCheckboxModule,
    MatRadioModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './intake-details.html',
  styleUrl: './intake-details.scss',
})
export class IntakeDetails {
  readonly ticket = input.required<TicketDetail>();
  /** The ticket after a saved edit. */
  readonly changed = output<TicketDetail>();
  /** Asks the page to load the ticket again (someone else changed it). */
  readonly reload = output<void>();

  private readonly api = inject(TicketApi);
  private readonly notifier = inject(Notifier);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);

  protected readonly kinds = EQUIPMENT_KINDS;
  protected readonly kindLabels = EQUIPMENT_KIND_LABELS;
  protected readonly symptoms = SYMPTOMS;
  protected readonly symptomLabels = SYMPTOM_LABELS;
  protected readonly accessoryChoices = COMMON_ACCESSORIES;
  protected readonly updateWords = UPDATE_WORDS;
  protected readonly message = controlMessage;

  protected readonly mayEdit = computed(() => this.session.worksTheBench() && this.ticket().state !== 'closed');
  /** Technicians add photos at any stage; the owner while the ticket is at intake. */
  protected readonly mayAddPhotos = computed(() => this.session.worksTheBench() || (this.ticket().state === 'intake' && this.session.hasAnyRole('member')));
  protected readonly symptomText = computed(() => this.ticket().symptoms.map((s) => SYMPTOM_LABELS[s]).join('; '));
  protected readonly editing = signal(false);
  protected readonly saving = signal(false);
  protected readonly error = signal('');

  protected readonly form = this.fb.group({
    equipmentKind: this.fb.control<EquipmentKind>('transceiver', Validators.required),
    makeModel: ['', [Validators.required, Validators.maxLength(120)]],
    serialNumber: ['', [Validators.maxLength(60)]],
    units: ['', [Validators.maxLength(500)]],
    firmwareVersions: ['', [Validators.maxLength(500)]],
    symptoms: this.fb.control<Symptom[]>([], someTicked),
    faultReported: ['', [Validators.required, Validators.minLength(5), Validators.maxLength(4000)]],
    accessories: this.fb.control<string[]>([]),
    otherAccessories: ['', [Validators.maxLength(600)]],
    accessoriesNote: ['', [Validators.maxLength(500)]],
    updatesBy: this.fb.control<UpdateChannel>('email'),
  });

  protected tagUrl(): string {
    return this.api.intakeTagUrl(this.ticket().tag);
  }

  protected startEdit(): void {
    const t = this.ticket();
    this.form.reset({
      equipmentKind: t.equipmentKind,
      makeModel: t.makeModel,
      serialNumber: t.serialNumber ?? '',
      units: t.units.join(', '),
      firmwareVersions: t.firmwareVersions ?? '',
      symptoms: t.symptoms,
      faultReported: t.faultReported,
      accessories: t.accessories.filter((a) => COMMON.includes(a)),
      otherAccessories: t.accessories.filter((a) => !COMMON.includes(a)).join(', '),
      accessoriesNote: t.accessoriesNote ?? '',
      updatesBy: t.updatesBy,
    });
    this.error.set('');
    this.editing.set(true);
  }

  protected has(control: AbstractControl<string[]>, item: string): boolean {
    return control.value.includes(item);
  }

  protected toggle<T extends string>(control: AbstractControl<T[]>, item: T, checked: boolean): void {
    const rest = control.value.filter((a) => a !== item);
    control.setValue(checked ? [...rest, item] : rest);
    control.markAsTouched();
  }

  /** Only what differs from the ticket is sent, with the version it was read at. */
  private body(): IntakeEditBody {
    const t = this.ticket();
    const v = this.form.getRawValue();
    const body: IntakeEditBody = { version: t.version };
    const same = (a: string[], b: string[]) => a.length === b.length && a.every((x, i) => x === b[i]);
    const text = (s: string) => (s.trim() ? s.trim() : null);
    if (v.equipmentKind !== t.equipmentKind) body.equipmentKind = v.equipmentKind;
    if (v.makeModel.trim() !== t.makeModel) body.makeModel = v.makeModel.trim();
    if (text(v.serialNumber) !== t.serialNumber) body.serialNumber = text(v.serialNumber);
    if (!same(splitList(v.units), t.units)) body.units = splitList(v.units);
    if (text(v.firmwareVersions) !== t.firmwareVersions) body.firmwareVersions = text(v.firmwareVersions);
    if (!same(v.symptoms, t.symptoms)) body.symptoms = v.symptoms;
    if (v.faultReported.trim() !== t.faultReported) body.faultReported = v.faultReported.trim();
    const accessories = [...v.accessories, ...splitList(v.otherAccessories).filter((a) => !v.accessories.includes(a))];
    if (!same(accessories, t.accessories)) body.accessories = accessories;
    if (text(v.accessoriesNote) !== t.accessoriesNote) body.accessoriesNote = text(v.accessoriesNote);
    if (v.updatesBy !== t.updatesBy) body.updatesBy = v.updatesBy;
    return body;
  }

  protected save(): void {
    this.error.set('');
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.error.set('Some fields need attention: see the messages below them.');
      return;
    }
    const body = this.body();
    if (Object.keys(body).length === 1) {
      this.editing.set(false);
      return;
    }
    this.saving.set(true);
    this.api.editIntake(this.ticket().tag, body).subscribe({
      next: (updated) => {
        this.saving.set(false);
        this.editing.set(false);
        this.changed.emit(updated);
        this.notifier.info(`Intake details of ${updated.tag} saved.`);
      },
      error: (err: unknown) => {
        this.saving.set(false);
        const apiError = readApiError(err);
        if (apiError.status === 409) {
          this.error.set(`${apiError.message} Your changes are still in the form.`);
          this.reload.emit();
          return;
        }
        this.error.set(placeServerError(this.form, apiError) || 'Some fields need attention: see the messages below them.');
      },
    });
  }
}
