// The text search shared by the ticket list and the Bench board: tag, make/model, serial number,
// owner name and owner call sign. Builds a SQL fragment with named replacements (never string
// concatenation of user input), or the same search as a Sequelize where clause.
import { Op, type WhereOptions } from 'sequelize';
import { parseTag } from './tag';
import type { Ticket } from './ticket.model';

/** Escapes LIKE wildcards so a search for "50%" or "a_b" means those characters. */
export function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** `alias` is the tickets table alias in the caller's query (a fixed identifier, not user input). */
export function ticketSearchSql(q: string, alias = 't'): { sql: string; replacements: Record<string, unknown> } {
  const text = q.trim();
  const like = `%${escapeLike(text)}%`;
  const parts = [
    `${alias}.make_model LIKE :searchLike`,
    `${alias}.serial_number LIKE :searchLike`,
    `${alias}.owner_name LIKE :searchLike`,
    `${alias}.owner_call_sign LIKE :searchLike`,
  ];
  const replacements: Record<string, unknown> = { searchLike: like };
  const id = searchedTicketId(text);
  if (id) {
    parts.push(`${alias}.id = :searchId`);
    replacements.searchId = id;
  }
  return { sql: `(${parts.join(' OR ')})`, replacements };
}

/** The same search as a where clause on the Ticket model (the ticket list). */
export function ticketSearchWhere(q: string): WhereOptions<Ticket> {
  const text = q.trim();
  const like = { [Op.like]: `%${escapeLike(text)}%` };
  const any: WhereOptions<Ticket>[] = [{ makeModel: like }, { serialNumber: like }, { ownerName: like }, { ownerCallSign: like }];
  const id = searchedTicketId(text);
  if (id) any.push({ id });
  return { [Op.or]: any };
}

/** "RW-0042", "rw-42" and "0042" all find ticket 42; undefined when the text names no ticket. */
function searchedTicketId(text: string): number | undefined {
  const tagLike = /^(?:rw-?)?(\d{1,10})$/i.exec(text);
  const id = tagLike ? Number(tagLike[1]) : parseTag(text);
  return id && Number.isSafeInteger(id) ? id : undefined;
}
