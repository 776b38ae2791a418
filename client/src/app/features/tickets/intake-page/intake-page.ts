import { BreakpointObserver } from '@angular/cdk/layout';
import { COMMA, ENTER } from '@angular/cdk/keycodes';
import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChild } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, FormGroup, NonNullableFormBuilder, ReactiveFormsModule, ValidationErrors, Validators } from '@angular/forms';
import { MatAutocompleteModule, MatAutocompleteSelectedEvent } from '@angular/material/autocomplete';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatChipInputEvent, MatChipsModule } from '@angular/material/chips';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { MatStepper, MatStepperModule } from '@angular/material/stepper';
import { RouterLink } from '@angular/router';
import { COMMON_ACCESSORIES, SYMPTOMS, SYMPTOM_LABELS } from '@contracts/tickets';
import { catchError, debounceTime, distinctUntilChanged, map, of, switchMap } from 'rxjs';
import { SessionStore } from '../../../core/auth/session-store';
import { Caution } from '../../../shared/caution/caution';
import { controlMessage, placeServerError } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { EQUIPMENT_KINDS, EQUIPMENT_KIND_LABELS, EquipmentKind } from '../../../shared/labels';
import { TicketApi } from '../ticket-api';
import { IntakeBody, OwnerSuggestion, Symptom, TicketDetail } from '../ticket.models';
import { TicketPhotos } from '../ticket-photos/ticket-photos';
import { OwnerMode, UpdatesChoice, ownerStepValidator, phoneValidator, someTicked, updatesProblem } from './intake-rules';

export const UNIT_SUGGESTIONS = ['display head', 'main body', 'DSP unit'] as const;
const MAX_UNITS = 8;
const FIX_FIELDS = 'Some fields need attention: go back to the step marked with a warning.';

function maxItems(max: number) {
  return (control: AbstractControl<string[]>): ValidationErrors | null =>
    control.value.length > max ? { maxItems: { max, actual: control.value.length } } : null;
}

/**
 * Hand in equipment: a stepper through owner, equipment, fault, accessories, consent and updates,
 * a check of everything, then the tag number, the printable intake tag and the condition photos.
 * Each step is checked before the next opens; the server checks everything again.
 */
@Component({
  selector: 'rw-intake-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    Caution,
    TicketPhotos,
    MatStepperModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatCheckboxModule,
    MatRadioModule,
    MatChipsModule,
    MatAutocompleteModule,
    MatButtonModule,
    MatIconModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './intake-page.html',
  styleUrl: './intake-page.scss',
})
export class IntakePage {
  private readonly api = inject(TicketApi);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);
  private readonly stepper = viewChild<MatStepper>('stepper');

  protected readonly kinds = EQUIPMENT_KINDS;
  protected readonly kindLabels = EQUIPMENT_KIND_LABELS;
  protected readonly symptoms = SYMPTOMS;
  protected readonly symptomLabels = SYMPTOM_LABELS;
  protected readonly accessoryChoices = COMMON_ACCESSORIES;
  protected readonly separatorKeys = [ENTER, COMMA] as const;
  protected readonly message = controlMessage;
  protected readonly orientation = toSignal(
    inject(BreakpointObserver)
      .observe('(min-width: 1000px)')
      .pipe(map((r) => (r.matches ? 'horizontal' : 'vertical') as 'horizontal' | 'vertical')),
    { initialValue: 'vertical' as const },
  );

  /** Technicians and admins hand in for a member or for someone at the bench; members for themselves. */
  protected readonly mayActForOwner = computed(() => this.session.hasAnyRole('technician', 'admin'));

  protected readonly owner = this.fb.group(
    {
      mode: this.fb.control<OwnerMode>('self'),
      accountId: this.fb.control<number | null>(null),
      memberSearch: [''],
      name: ['', [Validators.required, Validators.maxLength(100)]],
      email: ['', [Validators.email, Validators.maxLength(254)]],
      phone: ['', [Validators.maxLength(40), phoneValidator]],
      callSign: ['', [Validators.maxLength(12), Validators.pattern(/^[A-Za-z0-9/]{3,12}$/)]],
    },
    { validators: ownerStepValidator },
  );
  protected readonly equipment = this.fb.group({
    equipmentKind: this.fb.control<EquipmentKind | ''>('', Validators.required),
    makeModel: ['', [Validators.required, Validators.maxLength(120)]],
    serialNumber: ['', [Validators.maxLength(60)]],
    units: this.fb.control<string[]>([], maxItems(MAX_UNITS)),
    firmwareVersions: ['', [Validators.maxLength(500)]],
  });
  protected readonly fault = this.fb.group({
    symptoms: this.fb.control<Symptom[]>([], someTicked),
    faultReported: ['', [Validators.required, Validators.minLength(5), Validators.maxLength(4000)]],
  });
  protected readonly handedIn = this.fb.group({
    accessories: this.fb.control<string[]>([], maxItems(20)),
    accessoriesNote: ['', [Validators.maxLength(500)]],
  });
  protected readonly consent = this.fb.group({
    reflashConsent: [false],
    updatesBy: this.fb.control<UpdatesChoice | ''>('', [
      Validators.required,
      (c: AbstractControl<UpdatesChoice | ''>) => {
        const problem = updatesProblem(c.value, this.owner?.getRawValue() ?? { mode: 'self', email: '', phone: '' });
        return problem ? { server: problem } : null;
      },
    ]),
  });
  /** All steps, for the server's field errors ("owner.email", "symptoms", ...). */
  protected readonly form = new FormGroup({
    owner: this.owner,
    equipment: this.equipment,
    fault: this.fault,
    handedIn: this.handedIn,
    consent: this.consent,
  });

  protected readonly ownerMode = toSignal(this.owner.controls.mode.valueChanges, { initialValue: 'self' as OwnerMode });
  protected readonly chosenMember = signal<OwnerSuggestion | null>(null);
  protected readonly memberSuggestions = toSignal(
    this.owner.controls.memberSearch.valueChanges.pipe(
      debounceTime(250),
      map((q) => (typeof q === 'string' ? q.trim() : '')),
      distinctUntilChanged(),
      switchMap((q) => (q.length < 2 ? of([]) : this.api.searchOwners(q).pipe(map((r) => r.items), catchError(() => of([]))))),
    ),
    { initialValue: [] as OwnerSuggestion[] },
  );

  protected readonly unitText = signal('');
  private readonly units = toSignal(this.equipment.controls.units.valueChanges, { initialValue: [] as string[] });
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
    this.applyMode('self');
    this.owner.controls.mode.valueChanges.pipe(takeUntilDestroyed()).subscribe((mode) => this.applyMode(mode));
  }

  /** Only the fields of the chosen way count (disabled controls are not validated or sent). */
  private applyMode(mode: OwnerMode): void {
    const c = this.owner.controls;
    for (const name of ['name', 'email', 'phone', 'callSign'] as const) {
      if (mode === 'walkIn') c[name].enable({ emitEvent: false });
      else c[name].disable({ emitEvent: false });
    }
    if (mode === 'member') c.memberSearch.enable({ emitEvent: false });
    else c.memberSearch.disable({ emitEvent: false });
    this.owner.updateValueAndValidity();
    this.consent.controls.updatesBy.updateValueAndValidity();
  }

  protected pickMember(event: MatAutocompleteSelectedEvent): void {
    const member = event.option.value as OwnerSuggestion;
    this.chosenMember.set(member);
    this.owner.controls.accountId.setValue(member.id);
    this.owner.controls.memberSearch.setValue(member.displayName, { emitEvent: false });
  }

  protected memberLabel(m: OwnerSuggestion | string | null): string {
    return typeof m === 'string' ? m : (m?.displayName ?? '');
  }

  protected clearMember(): void {
    this.chosenMember.set(null);
    this.owner.controls.accountId.setValue(null);
    this.owner.controls.memberSearch.setValue('');
  }

  /** Next: mark the step's fields touched so their messages show; go on only when they are valid. */
  protected next(group: FormGroup): void {
    this.consent.controls.updatesBy.updateValueAndValidity();
    group.markAllAsTouched();
    if (group.invalid) return;
    this.stepper()?.next();
  }

  protected ownerSummary(): string {
    const v = this.owner.getRawValue();
    if (v.mode === 'self') return `${this.session.user()?.displayName ?? 'You'} (you)`;
    if (v.mode === 'member') return this.chosenMember()?.displayName ?? 'not chosen';
    return [v.name.trim(), v.email.trim(), v.phone.trim()].filter(Boolean).join(' · ');
  }

  protected unitList(): string[] {
    return this.equipment.controls.units.value;
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
    const units = this.equipment.controls.units;
    units.setValue(units.value.filter((u) => u !== unit));
    units.markAsDirty();
  }

  private pushUnit(raw: string): void {
    const unit = raw.trim().slice(0, 60);
    const units = this.equipment.controls.units;
    if (!unit || units.value.includes(unit)) return;
    units.setValue([...units.value, unit]);
    units.markAsTouched();
  }

  protected has(control: AbstractControl<string[]>, item: string): boolean {
    return control.value.includes(item);
  }

  protected toggle<T extends string>(control: AbstractControl<T[]>, item: T, checked: boolean): void {
    const rest = control.value.filter((a) => a !== item);
    control.setValue(checked ? [...rest, item] : rest);
    control.markAsTouched();
  }

  protected kindLabel(kind: EquipmentKind | ''): string {
    return kind ? EQUIPMENT_KIND_LABELS[kind] : 'Kind not chosen';
  }

  protected symptomWords(): string {
    return this.fault.controls.symptoms.value.map((s) => SYMPTOM_LABELS[s]).join('; ');
  }

  protected submit(): void {
    this.consent.controls.updatesBy.updateValueAndValidity();
    this.submitter.submit(
      () => this.api.create(this.body()),
      (ticket) => {
        this.opened.set(ticket);
        // The step "Check and hand in" is now complete: on to the tag and the photos.
        const stepper = this.stepper();
        if (stepper?.selected) {
          stepper.selected.completed = true;
          stepper.next();
        }
      },
    );
  }

  /** The request body: trimmed text, optional fields left out when empty. */
  private body(): IntakeBody {
    const o = this.owner.getRawValue();
    const e = this.equipment.getRawValue();
    const f = this.fault.getRawValue();
    const h = this.handedIn.getRawValue();
    const c = this.consent.getRawValue();
    const body: IntakeBody = {
      equipmentKind: e.equipmentKind as EquipmentKind,
      makeModel: e.makeModel.trim(),
      units: e.units,
      symptoms: f.symptoms,
      faultReported: f.faultReported.trim(),
      accessories: h.accessories,
      reflashConsent: c.reflashConsent,
      updatesBy: c.updatesBy as UpdatesChoice,
    };
    if (e.serialNumber.trim()) body.serialNumber = e.serialNumber.trim();
    if (e.firmwareVersions.trim()) body.firmwareVersions = e.firmwareVersions.trim();
    if (h.accessoriesNote.trim()) body.accessoriesNote = h.accessoriesNote.trim();
    if (this.mayActForOwner() && o.mode === 'member' && o.accountId) body.owner = { accountId: o.accountId };
    if (this.mayActForOwner() && o.mode === 'walkIn') {
      body.owner = {
        name: o.name.trim(),
        ...(o.email.trim() ? { email: o.email.trim() } : {}),
        ...(o.phone.trim() ? { phone: o.phone.trim() } : {}),
        ...(o.callSign.trim() ? { callSign: o.callSign.trim().toUpperCase() } : {}),
      };
    }
    return body;
  }

  protected tagUrl(tag: string): string {
    return this.api.intakeTagUrl(tag);
  }

  protected startAnother(): void {
    this.opened.set(null);
    this.form.reset();
    this.chosenMember.set(null);
    this.applyMode('self');
    this.stepper()?.reset();
  }
}
