// Fees, charges, payments and reconciliation: the JSON shapes of the API (client: @contracts/payments).
// Plain TypeScript: types and `as const` lists only. Every amount is an integer in minor units.

export const FEE_UNITS = ['each', 'hour'] as const;
export type FeeUnit = (typeof FEE_UNITS)[number];
export const PAYMENT_METHODS = ['card', 'cash', 'bank_transfer'] as const;
export type PaymentMethod = (typeof PAYMENT_METHODS)[number];
export const PAYMENT_STATUSES = ['pending', 'succeeded', 'failed'] as const;
export type PaymentStatus = (typeof PAYMENT_STATUSES)[number];

export interface FeePriceDto {
  effectiveFrom: string;
  memberPrice: number;
  nonMemberPrice: number;
}

/** A row of `GET /api/fees`: the price in force today and every dated price (newest first). */
export interface FeeItemDto {
  id: number;
  code: string;
  name: string;
  unit: FeeUnit;
  current: FeePriceDto | null;
  prices: FeePriceDto[];
}

export interface FeeScheduleDto {
  currency: string;
  today: string;
  items: FeeItemDto[];
}

export interface WaiverDto {
  id: number;
  amount: number;
  reason: string;
  at: string;
  byName: string | null;
  adjustment: boolean;
}

export interface ChargeDto {
  id: number;
  description: string;
  feeItemId: number | null;
  quantity: number;
  unitAmount: number;
  amount: number;
  memberRate: boolean;
  at: string;
  waived: number;
  paid: number;
  /** amount − waived − paid (refunds of payments are owed on the ticket as a whole). */
  open: number;
  waivers: WaiverDto[];
}

export interface RefundDto {
  id: number;
  amount: number;
  reason: string;
  at: string;
  adjustment: boolean;
}

export interface PaymentDto {
  id: number;
  method: PaymentMethod;
  status: PaymentStatus;
  amount: number;
  reference: string | null;
  receiptNumber: string | null;
  paidAt: string | null;
  failureMessage: string | null;
  refunded: number;
  refunds: RefundDto[];
}

export interface LedgerTotalsDto {
  charges: number;
  waivers: number;
  payments: number;
  refunds: number;
}

/** `GET /api/tickets/:tag/ledger` (and a booking's `GET /api/bookings/:bookingId/charges`). */
export interface LedgerDto {
  currency: string;
  charges: ChargeDto[];
  payments: PaymentDto[];
  totals: LedgerTotalsDto;
  /** charges − waivers − payments + refunds */
  balance: number;
  /** Balance zero: the hand-back guard lets the ticket close. */
  settled: boolean;
}

/** `POST /api/tickets/:tag/ledger/checkout`: where to send the payer. */
export interface CheckoutDto {
  paymentId: number;
  url: string;
  amount: number;
  currency: string;
}

export interface ReconPaymentRow {
  paymentId: number;
  ticketTag: string | null;
  method: PaymentMethod;
  amount: number;
  paidAt: string;
  receiptNumber: string | null;
  reference: string | null;
  allocated: number;
  refunded: number;
  matched: boolean;
  payoutId: string | null;
  adjustment: boolean;
}

export interface ReconPayoutItem {
  balanceTransactionId: string;
  type: string;
  source: string;
  amount: number;
  fee: number;
  net: number;
  paymentId: number | null;
  refundId: number | null;
  matched: boolean;
}

export interface ReconPayoutRow {
  payoutId: string;
  arrivalDate: string;
  amount: number;
  gross: number;
  fees: number;
  itemsNet: number;
  addsUp: boolean;
  items: ReconPayoutItem[];
}

export interface ReconProblem {
  kind: 'payment_without_charge' | 'payout_does_not_add_up' | 'provider_payment_unknown' | 'refund_not_reflected' | 'card_payment_not_paid_out';
  message: string;
  paymentId?: number;
  payoutId?: string;
  source?: string;
  amount?: number;
}

/** `GET /api/reconciliation/:month` (month = YYYY-MM). */
export interface ReconciliationDto {
  month: string;
  currency: string;
  closed: { at: string; byName: string | null } | null;
  payments: ReconPaymentRow[];
  refunds: { refundId: number; paymentId: number; amount: number; at: string; reason: string; providerRefundId: string | null; adjustment: boolean }[];
  payouts: ReconPayoutRow[];
  problems: ReconProblem[];
  totalsByFeeItem: { feeItemId: number | null; name: string; charged: number; waived: number }[];
  totalsByMethod: { method: PaymentMethod; received: number; refunded: number; net: number }[];
  /** Income per day of the month (received − refunded), by method, for the chart. */
  daily: { date: string; card: number; cash: number; bank_transfer: number }[];
  totals: { received: number; refunded: number; fees: number; paidOut: number; net: number };
  /** Where the provider could not be asked (payouts then stay empty). */
  providerError: string | null;
}
