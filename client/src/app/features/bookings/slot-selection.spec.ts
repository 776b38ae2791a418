import { nextSelection, MAX_SLOTS, Selection } from './slot-selection';

// Worked by hand: a 19:00-22:00 session in 30-minute slots, one taken at 20:00, and a second
// session that starts straight after a gap.
const slots = [
  { start: '19:00', end: '19:30', status: 'free' },
  { start: '19:30', end: '20:00', status: 'free' },
  { start: '20:00', end: '20:30', status: 'taken' },
  { start: '20:30', end: '21:00', status: 'free' },
  { start: '21:00', end: '21:30', status: 'free' },
  { start: '21:30', end: '22:00', status: 'free' },
  { start: '23:00', end: '23:30', status: 'free' },
];

describe('nextSelection', () => {
  it('starts, extends either way, and shrinks a run on one bench', () => {
    let s = nextSelection(slots, null, 1, 4);
    expect(s).toEqual({ benchId: 1, first: 4, last: 4 });
    s = nextSelection(slots, s, 1, 5);
    expect(s).toEqual({ benchId: 1, first: 4, last: 5 });
    s = nextSelection(slots, s, 1, 3);
    expect(s).toEqual({ benchId: 1, first: 3, last: 5 });
    s = nextSelection(slots, s, 1, 5);
    expect(s).toEqual({ benchId: 1, first: 3, last: 4 });
    s = nextSelection(slots, s, 1, 3);
    expect(s).toEqual({ benchId: 1, first: 4, last: 4 });
    expect(nextSelection(slots, s, 1, 4)).toBeNull();
  });

  it('never spans a taken slot, a gap between sessions, or two benches', () => {
    const s: Selection = { benchId: 1, first: 3, last: 5 };
    expect(nextSelection(slots, s, 1, 2)).toBe(s); // taken: nothing changes
    expect(nextSelection(slots, s, 1, 6)).toEqual({ benchId: 1, first: 6, last: 6 }); // 22:00 ≠ 23:00: new run
    expect(nextSelection(slots, s, 2, 3)).toEqual({ benchId: 2, first: 3, last: 3 });
    expect(nextSelection(slots, s, 1, 0)).toEqual({ benchId: 1, first: 0, last: 0 });
  });

  it('stops growing at the most slots one booking may hold', () => {
    const many = Array.from({ length: 12 }, (_, i) => ({ start: `t${i}`, end: `t${i + 1}`, status: 'free' }));
    let s: Selection | null = null;
    for (let i = 0; i < MAX_SLOTS; i++) s = nextSelection(many, s, 1, i);
    expect(s).toEqual({ benchId: 1, first: 0, last: MAX_SLOTS - 1 });
    s = nextSelection(many, s, 1, MAX_SLOTS); // one more: a new run starts there instead
    expect(s).toEqual({ benchId: 1, first: MAX_SLOTS, last: MAX_SLOTS });
  });
});
