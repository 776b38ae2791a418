// GET /xmodem, /rf, /dc-drop: the bench's computations for the client and for scripts.
// Mounted by the app at /api/calc behind the "signed in" middleware. Handlers only parse the
// query and call the domain; nothing is stored.
import { Router } from 'express';
import { parseInput, ValidationError } from '../../errors';
import { CalcInputError } from '../../domain/input-error';
import { planXmodemTransfer } from '../../domain/xmodem';
import { rfFigures } from '../../domain/rf';
import { dcLeadDrop, type LeadGauge } from '../../domain/dc-lead';
import { dcDropQuery, rfQuery, xmodemQuery } from './calc.schemas';

/** Runs a domain computation, turning its input errors into the API's 400 with the field named. */
function compute<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof CalcInputError) throw new ValidationError(`${err.field}: ${err.message}`, { [err.field]: err.message });
    throw err;
  }
}

export const calcRouter = Router();

calcRouter.get('/xmodem', (req, res) => {
  const q = parseInput(xmodemQuery, req.query);
  res.json(compute(() => planXmodemTransfer(q)));
});

calcRouter.get('/rf', (req, res) => {
  const q = parseInput(rfQuery, req.query);
  res.json(compute(() => rfFigures(q.forwardW, q.reflectedW)));
});

calcRouter.get('/dc-drop', (req, res) => {
  const q = parseInput(dcDropQuery, req.query);
  const gauge = (q.awg !== undefined ? { awg: q.awg } : { mm2: q.mm2 }) as LeadGauge;
  res.json(
    compute(() =>
      dcLeadDrop({ currentA: q.currentA, lengthM: q.lengthM, gauge, supplyV: q.supplyV, nominalV: q.nominalV, tolerancePct: q.tolerancePct }),
    ),
  );
});
