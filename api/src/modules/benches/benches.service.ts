// Benches (with their instruments) and opening rules: admin edits, everyone signed in reads benches.
import { UniqueConstraintError } from 'sequelize';
import { ConflictError, NotFoundError, ValidationError } from '../../errors';
import type { Bench as BenchDto, OpeningRule as OpeningRuleDto } from '../../contracts/bookings';
import type { OpeningRuleFacts } from '../../domain/bench-slots';
import { Bench, OpeningRule } from './bench.model';
import type { CreateBenchBody, CreateRuleBody, PatchBenchBody } from './benches.schemas';

export function benchDto(b: Bench): BenchDto {
  return {
    id: b.id,
    name: b.name,
    location: b.location,
    instruments: typeof b.instruments === 'string' ? JSON.parse(b.instruments) : b.instruments,
    outOfService: !!b.outOfService,
    outOfServiceReason: b.outOfService ? b.outOfServiceReason : null,
    outOfServiceUntil: b.outOfService && b.outOfServiceUntil ? b.outOfServiceUntil.toISOString() : null,
  };
}

/** Is the bench out of service at `at`? (Out of service with no end date: until further notice.) */
export function outOfServiceAt(b: BenchDto, at: Date): boolean {
  return b.outOfService && (!b.outOfServiceUntil || at < new Date(b.outOfServiceUntil));
}

export async function listBenches(): Promise<BenchDto[]> {
  return (await Bench.findAll({ order: [['name', 'ASC']] })).map(benchDto);
}

function nameTaken(err: unknown): never {
  if (err instanceof UniqueConstraintError) throw new ConflictError('bench_name_taken', 'Another bench already has that name; choose another.');
  throw err;
}

export async function createBench(input: CreateBenchBody): Promise<BenchDto> {
  const bench = await Bench.create({
    name: input.name,
    location: input.location ?? null,
    instruments: input.instruments,
    outOfService: input.outOfService,
    outOfServiceReason: input.outOfService ? (input.outOfServiceReason ?? null) : null,
    outOfServiceUntil: input.outOfService && input.outOfServiceUntil ? new Date(input.outOfServiceUntil) : null,
  }).catch(nameTaken);
  return benchDto(bench);
}

export async function updateBench(id: number, input: PatchBenchBody): Promise<BenchDto> {
  const bench = await Bench.findByPk(id);
  if (!bench) throw new NotFoundError('No bench with that number.', 'bench_not_found');
  if (input.name !== undefined) bench.name = input.name;
  if (input.location !== undefined) bench.location = input.location;
  if (input.instruments !== undefined) bench.instruments = input.instruments;
  if (input.outOfService !== undefined) bench.outOfService = input.outOfService;
  if (input.outOfServiceReason !== undefined) bench.outOfServiceReason = input.outOfServiceReason;
  if (input.outOfServiceUntil !== undefined) bench.outOfServiceUntil = input.outOfServiceUntil ? new Date(input.outOfServiceUntil) : null;
  if (bench.outOfService && !bench.outOfServiceReason) {
    throw new ValidationError('Say why the bench is out of service.', { outOfServiceReason: 'Say why the bench is out of service.' });
  }
  if (!bench.outOfService) {
    bench.outOfServiceReason = null;
    bench.outOfServiceUntil = null;
  }
  await bench.save().catch(nameTaken);
  return benchDto(bench);
}

export function ruleDto(r: OpeningRule): OpeningRuleDto & OpeningRuleFacts {
  return {
    id: r.id,
    kind: r.kind,
    weekday: r.weekday,
    startTime: r.startTime,
    endTime: r.endTime,
    validFrom: r.validFrom,
    validUntil: r.validUntil,
    note: r.note,
  };
}

export async function listRules(): Promise<(OpeningRuleDto & OpeningRuleFacts)[]> {
  const rules = await OpeningRule.findAll({ order: [['kind', 'ASC'], ['weekday', 'ASC'], ['validFrom', 'ASC'], ['startTime', 'ASC'], ['id', 'ASC']] });
  return rules.map(ruleDto);
}

export async function createRule(input: CreateRuleBody): Promise<OpeningRuleDto> {
  return ruleDto(await OpeningRule.create(input));
}

export async function deleteRule(id: number): Promise<void> {
  const n = await OpeningRule.destroy({ where: { id } });
  if (n === 0) throw new NotFoundError('No opening rule with that number.', 'rule_not_found');
}
