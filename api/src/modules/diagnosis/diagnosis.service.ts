// The diagnosis record: first checks with results, measurements with units, findings and the
// decision. One record per ticket, saved as a whole while the ticket is in Diagnosis; each save is
// an internal event on the timeline (the owner's page never shows it).
import { OptimisticLockError, UniqueConstraintError } from 'sequelize';
import type { AppDeps } from '../../deps';
import { ConflictError, RuleError } from '../../errors';
import { DIAGNOSIS_CHECKS, DIAGNOSIS_DECISION_LABELS, type CheckResult, type DiagnosisCheck, type DiagnosisRecord } from '../../contracts/owner-records';
import type { SessionUser } from '../auth/session-user';
import { TicketEvent, type Ticket } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { findVisibleTicket } from '../tickets/tickets.service';
import { Diagnosis } from './diagnosis.model';
import type { DiagnosisInput } from './diagnosis.schemas';

export type DiagnosisDeps = Pick<AppDeps, 'sequelize' | 'clock'>;

const STALE = 'Someone else saved this diagnosis a moment ago. Reload to see their version, then save yours again.';

function toRecord(ticket: Ticket, d: Diagnosis | null): DiagnosisRecord {
  const checks = Object.fromEntries(
    DIAGNOSIS_CHECKS.map((k): [DiagnosisCheck, CheckResult] => [k, d?.checks?.[k] ?? { done: false, result: null }]),
  ) as Record<DiagnosisCheck, CheckResult>;
  return {
    tag: formatTag(ticket.id),
    editable: ticket.state === 'diagnosis',
    checks,
    supplyAtRadioV: d?.supplyAtRadioV ?? null,
    idleCurrentA: d?.idleCurrentA ?? null,
    transmitCurrentA: d?.transmitCurrentA ?? null,
    lead: d && d.leadLengthM !== null && d.leadGauge && d.sourceSupplyV !== null ? { lengthM: d.leadLengthM, gauge: d.leadGauge, sourceV: d.sourceSupplyV } : null,
    findings: d?.findings ?? null,
    decision: d?.decision ?? null,
    returnReason: d?.returnReason ?? null,
    // 0 before the first save, then the row's lock version + 1 (the row starts at 0).
    version: d ? d.version + 1 : 0,
    savedAt: d?.updatedAt ? new Date(d.updatedAt).toISOString() : null,
    savedBy: d?.editor?.displayName ?? null,
  };
}

export async function getDiagnosis(_deps: DiagnosisDeps, user: SessionUser, input: { tag: string }): Promise<DiagnosisRecord> {
  const ticket = await findVisibleTicket(user, input.tag);
  const d = await Diagnosis.findByPk(ticket.id, { include: [{ association: 'editor', attributes: ['id', 'displayName'] }] });
  return toRecord(ticket, d);
}

/** One line for the timeline: what this save recorded. */
function saveSummary(input: DiagnosisInput): string {
  const done = DIAGNOSIS_CHECKS.filter((k) => input.checks[k]?.done).length;
  const parts = [`Diagnosis saved: ${done} of ${DIAGNOSIS_CHECKS.length} first checks done`];
  const m: string[] = [];
  if (input.supplyAtRadioV !== null) m.push(`${input.supplyAtRadioV.toFixed(2)} V at the radio`);
  if (input.idleCurrentA !== null) m.push(`${input.idleCurrentA.toFixed(2)} A idle`);
  if (input.transmitCurrentA !== null) m.push(`${input.transmitCurrentA.toFixed(2)} A transmitting`);
  if (m.length) parts.push(m.join(', '));
  if (input.decision) parts.push(`decision: ${DIAGNOSIS_DECISION_LABELS[input.decision]}${input.returnReason ? ` (${input.returnReason})` : ''}`);
  return `${parts.join('; ')}.`;
}

export async function saveDiagnosis(deps: DiagnosisDeps, user: SessionUser, input: { tag: string } & DiagnosisInput): Promise<DiagnosisRecord> {
  const { sequelize, clock } = deps;
  const ticket = await findVisibleTicket(user, input.tag);
  if (ticket.state !== 'diagnosis') {
    throw new RuleError('not_in_diagnosis', 'The diagnosis record can be changed only while the ticket is in Diagnosis.');
  }
  const fields = {
    checks: Object.fromEntries(DIAGNOSIS_CHECKS.filter((k) => input.checks[k]).map((k) => [k, input.checks[k]])),
    supplyAtRadioV: input.supplyAtRadioV,
    idleCurrentA: input.idleCurrentA,
    transmitCurrentA: input.transmitCurrentA,
    leadLengthM: input.lead?.lengthM ?? null,
    leadGauge: input.lead?.gauge ?? null,
    sourceSupplyV: input.lead?.sourceV ?? null,
    findings: input.findings,
    decision: input.decision,
    returnReason: input.decision === 'return_unrepaired' ? input.returnReason : null,
    updatedBy: user.id,
  };
  try {
    await sequelize.transaction(async (transaction) => {
      const now = clock();
      const existing = await Diagnosis.findByPk(ticket.id, { transaction });
      if ((existing ? existing.version + 1 : 0) !== input.version) throw new ConflictError('stale_version', STALE);
      if (existing) {
        existing.set(fields);
        existing.changed('checks', true);
        await existing.save({ transaction });
      } else {
        await Diagnosis.create({ ticketId: ticket.id, ...fields, createdAt: now, updatedAt: now }, { transaction });
      }
      await TicketEvent.create(
        { ticketId: ticket.id, actorId: user.id, kind: 'diagnosis_saved', fromState: null, toState: null, note: saveSummary(input), ownerVisible: false, createdAt: now },
        { transaction },
      );
    });
  } catch (err) {
    // Two first saves at once: the primary key lets one in; two later saves: the version does.
    if (err instanceof OptimisticLockError || err instanceof UniqueConstraintError) throw new ConflictError('stale_version', STALE);
    throw err;
  }
  return getDiagnosis(deps, user, input);
}
