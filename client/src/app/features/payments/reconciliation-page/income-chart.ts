import { ChangeDetectionStrategy, Component, ElementRef, effect, input, OnDestroy, viewChild } from '@angular/core';
import { BarController, BarElement, CategoryScale, Chart, Legend, LinearScale, Tooltip } from 'chart.js';
import type { ReconciliationDto } from '@contracts/payments';
import { formatMoney, METHOD_LABELS } from '../money-format';

Chart.register(BarController, BarElement, CategoryScale, LinearScale, Tooltip, Legend);

/** The month's income per day, stacked by payment method (chart.js); the table beside it says the same in words. */
@Component({
  selector: 'rw-income-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<div class="chart-box"><canvas #canvas role="img" [attr.aria-label]="label()"></canvas></div>`,
  styles: `.chart-box { position: relative; height: 260px; width: 100%; }`,
})
export class IncomeChart implements OnDestroy {
  readonly month = input.required<ReconciliationDto>();
  private readonly canvas = viewChild.required<ElementRef<HTMLCanvasElement>>('canvas');
  private chart?: Chart;

  protected label(): string {
    const m = this.month();
    return `Income per day in ${m.month}: ${formatMoney(m.totals.received - m.totals.refunded, m.currency)} in all. The totals table gives the figures.`;
  }

  constructor() {
    effect(() => {
      const m = this.month();
      // The theme's colours are CSS variables that may hold light-dark(...), which a canvas cannot
      // read: let the browser resolve each one on a hidden probe and take the computed rgb().
      const host = this.canvas().nativeElement.parentElement!;
      const colour = (name: string, fallback: string) => {
        const probe = document.createElement('span');
        probe.style.display = 'none';
        probe.style.color = `var(${name}, ${fallback})`;
        host.appendChild(probe);
        const value = getComputedStyle(probe).color;
        probe.remove();
        return value || fallback;
      };
      const text = colour('--mat-sys-on-surface', '#1b1b1b');
      const grid = colour('--mat-sys-outline-variant', '#c4c7c5');
      const digits = 10 ** (new Intl.NumberFormat('en', { style: 'currency', currency: m.currency }).resolvedOptions().maximumFractionDigits ?? 2);
      const series = (['card', 'cash', 'bank_transfer'] as const).map((method, i) => ({
        label: METHOD_LABELS[method],
        data: m.daily.map((d) => d[method] / digits),
        backgroundColor: [colour('--mat-sys-primary', '#00677f'), colour('--mat-sys-tertiary', '#8b5000'), colour('--mat-sys-secondary', '#4c626a')][i],
        stack: 'income',
      }));
      this.chart?.destroy();
      this.chart = new Chart(this.canvas().nativeElement, {
        type: 'bar',
        data: { labels: m.daily.map((d) => d.date.slice(8)), datasets: series },
        options: {
          maintainAspectRatio: false,
          animation: false,
          scales: {
            x: { stacked: true, ticks: { color: text }, grid: { color: grid } },
            y: { stacked: true, ticks: { color: text }, grid: { color: grid } },
          },
          plugins: {
            legend: { labels: { color: text } },
            tooltip: { callbacks: { label: (ctx) => `${ctx.dataset.label}: ${formatMoney(Math.round(Number(ctx.raw) * digits), m.currency)}` } },
          },
        },
      });
    });
  }

  ngOnDestroy(): void {
    this.chart?.destroy();
  }
}
