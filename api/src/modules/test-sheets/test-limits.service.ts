// The club's test limits: the code's defaults (with their sources, domain/test-sheet.ts) overlaid
// by the rows an admin has set. Each change is one row per limit, with who set it and when.
import type { Transaction } from 'sequelize';
import type { AppDeps } from '../../deps';
import { ValidationError } from '../../errors';
import { DEFAULT_TEST_LIMITS, TEST_LIMIT_KEYS, limitsConflict, type TestLimitKey, type TestLimits } from '../../domain/test-sheet';
import type { TestLimitsView } from '../../contracts/bench-records';
import type { SessionUser } from '../auth/session-user';
import { TestLimitRow } from './test-sheet.model';
import type { TestLimitsPatch } from './test-sheets.schemas';

const isKey = (k: string): k is TestLimitKey => (TEST_LIMIT_KEYS as readonly string[]).includes(k);

export async function readTestLimits(transaction?: Transaction): Promise<TestLimitsView> {
  const rows = await TestLimitRow.findAll({ transaction });
  const limits: TestLimits = structuredClone(DEFAULT_TEST_LIMITS);
  const custom: TestLimitKey[] = [];
  let updatedAt: Date | null = null;
  for (const r of rows) {
    if (!isKey(r.limitKey)) continue;
    limits[r.limitKey] = { value: Number(r.value), source: r.source };
    custom.push(r.limitKey);
    if (!updatedAt || r.updatedAt > updatedAt) updatedAt = r.updatedAt;
  }
  return { limits, custom: TEST_LIMIT_KEYS.filter((k) => custom.includes(k)), updatedAt: updatedAt ? updatedAt.toISOString() : null };
}

/** Sets the limits given (admins); the others stay as they are. Refused as a whole when the result cannot stand together. */
export async function updateTestLimits(deps: Pick<AppDeps, 'sequelize' | 'clock'>, user: SessionUser, patch: TestLimitsPatch): Promise<TestLimitsView> {
  await deps.sequelize.transaction(async (transaction) => {
    const current = await readTestLimits(transaction);
    const next: TestLimits = { ...current.limits };
    for (const key of TEST_LIMIT_KEYS) if (patch[key]) next[key] = patch[key]!;
    const conflict = limitsConflict(next);
    if (conflict) throw new ValidationError(conflict.message, { [`${conflict.key}.value`]: conflict.message });
    const now = deps.clock();
    for (const key of TEST_LIMIT_KEYS) {
      const p = patch[key];
      if (p) await TestLimitRow.upsert({ limitKey: key, value: p.value, source: p.source, updatedBy: user.id, updatedAt: now }, { transaction });
    }
  });
  return readTestLimits();
}
