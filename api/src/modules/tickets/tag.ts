// Tag numbers: what a person quotes for a ticket. Derived from the id, never stored:
// RW- and the id zero-padded to four digits (RW-0042); longer ids simply grow (RW-12345).

export function formatTag(id: number): string {
  return `RW-${String(id).padStart(4, '0')}`;
}

/** The id behind a tag, or null when the text is not a tag in its one canonical spelling. */
export function parseTag(tag: string): number | null {
  const match = /^RW-(\d{4,10})$/i.exec(tag.trim());
  if (!match) return null;
  const id = Number(match[1]);
  if (!Number.isSafeInteger(id) || id < 1) return null;
  // RW-00042 is not a spelling of RW-0042: one ticket, one tag.
  if (formatTag(id) !== `RW-${match[1]}`) return null;
  return id;
}
