// Choosing one or more consecutive free slots on one bench: a pure function, so the rules are
// tested on their own (slot-selection.spec.ts).

export interface SlotLike {
  start: string;
  end: string;
  status: string;
}

/** A run of consecutive slots on one bench: indexes into that bench's slot list, first to last. */
export interface Selection {
  benchId: number;
  first: number;
  last: number;
}

/** At most this many consecutive slots in one booking (the API's limit). */
export const MAX_SLOTS = 8;

/**
 * The selection after a click on slot `index` of bench `benchId`:
 * a free slot next to the run (and touching it in time) extends it; an end of the run shrinks it;
 * any other free slot starts a new run; anything not free leaves the selection as it was.
 */
export function nextSelection(slots: readonly SlotLike[], current: Selection | null, benchId: number, index: number): Selection | null {
  const slot = slots[index];
  if (!slot) return current;
  const sameBench = current?.benchId === benchId;
  if (sameBench && current && index >= current.first && index <= current.last) {
    if (current.first === current.last) return null;
    if (index === current.first) return { ...current, first: index + 1 };
    if (index === current.last) return { ...current, last: index - 1 };
    return { benchId, first: index, last: index };
  }
  if (slot.status !== 'free') return current;
  if (sameBench && current && current.last - current.first + 1 < MAX_SLOTS) {
    if (index === current.last + 1 && slots[current.last]!.end === slot.start) return { ...current, last: index };
    if (index === current.first - 1 && slot.end === slots[current.first]!.start) return { ...current, first: index };
  }
  return { benchId, first: index, last: index };
}

export function selectionSize(s: Selection | null): number {
  return s ? s.last - s.first + 1 : 0;
}
