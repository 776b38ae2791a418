// The fee schedule the treasurer keeps: items with dated member and non-member prices. A new price
// starts today or later; charges copy the price they were made at, so no change of the schedule
// ever alters a charge already made.
import { UniqueConstraintError } from 'sequelize';
import { ConflictError, ForbiddenError, NotFoundError, RuleError } from '../../errors';
import { priceOn } from '../../domain/money';
import type { FeeItemDto, FeeScheduleDto, FeeUnit } from '../../contracts/payments';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';
import { FeeItem, FeePriceRow } from './payments.model';
import { clubMoney, localDate, type PaymentsDeps } from './ledger.service';

export async function feeSchedule(deps: PaymentsDeps): Promise<FeeScheduleDto> {
  const { currency, timeZone } = await clubMoney(deps.sequelize);
  const today = localDate(deps.clock(), timeZone);
  const [items, prices] = await Promise.all([FeeItem.findAll({ order: [['name', 'ASC']] }), FeePriceRow.findAll({ order: [['effectiveFrom', 'DESC']] })]);
  return {
    currency,
    today,
    items: items.map((item): FeeItemDto => {
      const own = prices.filter((p) => p.feeItemId === item.id).map((p) => ({ effectiveFrom: p.effectiveFrom, memberPrice: p.memberPrice, nonMemberPrice: p.nonMemberPrice }));
      return { id: item.id, code: item.code, name: item.name, unit: item.unit, current: priceOn(own, today), prices: own };
    }),
  };
}

function requireTreasurer(user: SessionUser) {
  if (!hasRole(user, 'treasurer')) throw new ForbiddenError('Only the treasurer keeps the fee schedule.');
}

async function today(deps: PaymentsDeps): Promise<string> {
  const { timeZone } = await clubMoney(deps.sequelize);
  return localDate(deps.clock(), timeZone);
}

export interface PriceInput {
  memberPrice: number;
  nonMemberPrice: number;
  effectiveFrom: string;
}

function checkDate(effectiveFrom: string, todayDate: string) {
  if (effectiveFrom < todayDate) {
    throw new RuleError('price_in_past', `A price starts today (${todayDate}) or later: charges already made keep the price they were made at.`);
  }
}

export async function createFeeItem(deps: PaymentsDeps, user: SessionUser, input: { code: string; name: string; unit: FeeUnit } & PriceInput): Promise<FeeScheduleDto> {
  requireTreasurer(user);
  checkDate(input.effectiveFrom, await today(deps));
  try {
    await deps.sequelize.transaction(async (transaction) => {
      const now = deps.clock();
      const item = await FeeItem.create({ code: input.code, name: input.name, unit: input.unit, createdAt: now }, { transaction });
      await FeePriceRow.create(
        { feeItemId: item.id, effectiveFrom: input.effectiveFrom, memberPrice: input.memberPrice, nonMemberPrice: input.nonMemberPrice, createdBy: user.id, createdAt: now },
        { transaction },
      );
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new ConflictError('fee_code_taken', `There is already a fee item with the code ${input.code}. Choose another code.`);
    throw err;
  }
  return feeSchedule(deps);
}

export async function addFeePrice(deps: PaymentsDeps, user: SessionUser, input: { feeId: number } & PriceInput): Promise<FeeScheduleDto> {
  requireTreasurer(user);
  const item = await FeeItem.findByPk(input.feeId);
  if (!item) throw new NotFoundError('There is no such fee item.', 'fee_not_found');
  checkDate(input.effectiveFrom, await today(deps));
  try {
    await FeePriceRow.create({
      feeItemId: item.id,
      effectiveFrom: input.effectiveFrom,
      memberPrice: input.memberPrice,
      nonMemberPrice: input.nonMemberPrice,
      createdBy: user.id,
      createdAt: deps.clock(),
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new ConflictError('price_date_taken', `${item.name} already has a price starting ${input.effectiveFrom}. Pick another date.`);
    throw err;
  }
  return feeSchedule(deps);
}
