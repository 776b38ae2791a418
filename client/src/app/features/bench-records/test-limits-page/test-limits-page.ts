import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormGroup, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { DEFAULT_TEST_LIMITS, TEST_LIMIT_DEFINITIONS, TEST_LIMIT_KEYS, type TestLimit, type TestLimitKey } from '@domain/test-sheet';
import { Notifier } from '../../../core/notifier';
import { controlMessage } from '../../../shared/form-errors';
import { FormSubmitter } from '../../../shared/form-submit';
import { BenchRecordsApi } from '../bench-records-api';
import { TestLimitsView } from '../bench-records.models';

type LimitGroup = FormGroup<{ value: import('@angular/forms').FormControl<number | null>; source: import('@angular/forms').FormControl<string> }>;

/** Admins: the club's limits for test sheets, each with where it comes from. */
@Component({
  selector: 'rw-test-limits-page',
  imports: [ReactiveFormsModule, DatePipe, MatButtonModule, MatCardModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './test-limits-page.html',
  styleUrl: './test-limits-page.scss',
})
export class TestLimitsPage {
  private readonly api = inject(BenchRecordsApi);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly notifier = inject(Notifier);
  protected readonly keys = TEST_LIMIT_KEYS;
  protected readonly defs = TEST_LIMIT_DEFINITIONS;
  protected readonly defaults = DEFAULT_TEST_LIMITS;
  protected readonly message = controlMessage;

  protected readonly limits = rxResource({ stream: () => this.api.limits() });
  readonly form = this.fb.group(
    Object.fromEntries(
      TEST_LIMIT_KEYS.map((k) => {
        const b = TEST_LIMIT_DEFINITIONS[k].bound;
        return [
          k,
          this.fb.group({
            value: [null as number | null, [Validators.required, Validators.min(b.min), Validators.max(b.max)]],
            source: ['', [Validators.required, Validators.minLength(3), Validators.maxLength(300)]],
          }),
        ];
      }),
    ) as Record<TestLimitKey, LimitGroup>,
  );
  protected readonly submitter = new FormSubmitter(this.form, { invalidMessage: 'Some limits need attention: see the marked fields.' });
  protected readonly saved = signal<TestLimitsView | null>(null);

  constructor() {
    effect(() => {
      if (!this.limits.hasValue()) return;
      const view = this.limits.value();
      untracked(() => this.fill(view));
    });
  }

  fill(view: TestLimitsView): void {
    this.form.setValue(Object.fromEntries(TEST_LIMIT_KEYS.map((k) => [k, { value: view.limits[k].value, source: view.limits[k].source }])) as Record<TestLimitKey, { value: number; source: string }>);
    this.form.markAsPristine();
  }

  group(key: TestLimitKey): LimitGroup {
    return this.form.controls[key];
  }

  /** Only the limits that changed are sent. */
  changes(): Partial<Record<TestLimitKey, TestLimit>> {
    const out: Partial<Record<TestLimitKey, TestLimit>> = {};
    for (const k of TEST_LIMIT_KEYS) {
      const g = this.group(k);
      if (g.dirty) out[k] = { value: Number(g.controls.value.value), source: g.controls.source.value.trim() };
    }
    return out;
  }

  protected useDefault(key: TestLimitKey): void {
    this.group(key).setValue({ value: DEFAULT_TEST_LIMITS[key].value, source: DEFAULT_TEST_LIMITS[key].source });
    this.group(key).markAsDirty();
  }

  protected save(): void {
    if (Object.keys(this.changes()).length === 0) {
      this.submitter.formError.set('Nothing has changed yet: edit a limit or its source first.');
      return;
    }
    this.submitter.submit(
      () => this.api.updateLimits(this.changes()),
      (view) => {
        // The page reads which limits the club set from the loaded view: show the saved one at once.
        this.limits.value.set(view);
        this.fill(view);
        this.saved.set(view);
        this.notifier.info('Test limits saved. New test sheets are judged by them; saved sheets keep the limits they were judged by.');
      },
    );
  }

  protected valueMessage(key: TestLimitKey): string {
    const c = this.group(key).controls.value;
    const b = TEST_LIMIT_DEFINITIONS[key].bound;
    if (c.errors?.['min'] || c.errors?.['max']) return `Use ${b.min} to ${b.max}${b.unit ? ` ${b.unit}` : ''}.`;
    return controlMessage(c, 'the limit');
  }
}
