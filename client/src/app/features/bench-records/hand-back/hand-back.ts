import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormArray, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { SessionStore } from '../../../core/auth/session-store';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { TicketDetail } from '../../tickets/ticket.models';
import { BenchRecordsApi } from '../bench-records-api';
import { handBackItemValidator } from '../bench-records-forms';
import { HandBackBody } from '../bench-records.models';

/** Return lane: the returned-items checklist (from what was handed in), who collected it and when. */
@Component({
  selector: 'rw-hand-back',
  imports: [ReactiveFormsModule, DatePipe, MatButtonModule, MatCardModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './hand-back.html',
  styleUrl: './hand-back.scss',
})
export class HandBackSection {
  readonly ticket = input.required<TicketDetail>();
  readonly recorded = output<void>();

  private readonly api = inject(BenchRecordsApi);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly session = inject(SessionStore);
  protected readonly message = controlMessage;

  private readonly revision = signal(0);
  protected readonly view = rxResource({
    params: () => ({ tag: this.ticket().tag, revision: this.revision() }),
    stream: ({ params }) => this.api.handBack(params.tag),
  });
  protected readonly canRecord = computed(() => this.session.worksTheBench() && this.view.hasValue() && this.view.value().canRecord);

  protected readonly form = this.fb.group({
    items: this.fb.array([] as ReturnType<HandBackSection['itemGroup']>[]),
    extras: this.fb.array([] as ReturnType<HandBackSection['extraGroup']>[]),
    collectedBy: ['', [Validators.required, Validators.minLength(2), Validators.maxLength(100)]],
    collectedAt: [''],
  });
  protected readonly submitter = new FormSubmitter(this.form, { invalidMessage: 'The checklist needs attention: see the marked items.' });

  constructor() {
    // The checklist starts from the accessories handed in, all ticked; the owner's name as collector.
    effect(() => {
      const t = this.ticket();
      untracked(() => this.startFrom(t.accessories, t.ownerName));
    });
  }

  itemGroup(item: string) {
    return this.fb.group({ item: [item], returned: [true], note: ['', [Validators.maxLength(300)]] }, { validators: handBackItemValidator });
  }

  extraGroup() {
    return this.fb.group({ item: ['', [Validators.required, Validators.maxLength(100)]], note: ['', [Validators.required, Validators.minLength(3), Validators.maxLength(300)]] });
  }

  startFrom(accessories: string[], ownerName: string): void {
    this.items.clear();
    for (const a of accessories) this.items.push(this.itemGroup(a));
    this.extras.clear();
    this.form.controls.collectedBy.setValue(ownerName);
    this.form.controls.collectedAt.setValue('');
  }

  protected get items(): FormArray<ReturnType<HandBackSection['itemGroup']>> {
    return this.form.controls.items;
  }

  protected get extras(): FormArray<ReturnType<HandBackSection['extraGroup']>> {
    return this.form.controls.extras;
  }

  protected addExtra(): void {
    this.extras.push(this.extraGroup());
  }

  body(): HandBackBody {
    const v = this.form.getRawValue();
    return {
      items: v.items.map((i) => ({ item: i.item, returned: i.returned, note: i.note.trim() || null })),
      extras: v.extras.map((e) => ({ item: e.item.trim(), note: e.note.trim() })),
      collectedBy: v.collectedBy.trim(),
      ...(v.collectedAt ? { collectedAt: new Date(v.collectedAt).toISOString() } : {}),
    };
  }

  protected save(): void {
    this.submitter.submit(
      () => this.api.recordHandBack(this.ticket().tag, this.body()),
      () => {
        this.revision.update((r) => r + 1);
        this.recorded.emit();
      },
    );
  }
}
