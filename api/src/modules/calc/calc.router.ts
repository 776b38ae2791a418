// The bench's computations for the client and for scripts: GET /xmodem, /rf, /dc-drop, /level,
// /dummy-load, /attenuator, /line-loss, /discharge. Mounted by the app at /api/calc behind the
// "signed in" middleware. Handlers only parse the query (zod, plain messages) and call the domain;
// nothing is stored. A domain function that refuses its input throws CalcInputError, which the
// central error handler in app.ts answers as 400 validation_failed with the field named.
import { Router } from 'express';
import { parseInput } from '../../errors';
import { planXmodemTransfer } from '../../domain/xmodem';
import { rfFigures } from '../../domain/rf';
import { dcLeadDrop, type LeadGauge } from '../../domain/dc-lead';
import { signalLevel } from '../../domain/levels';
import { dummyLoadFigures } from '../../domain/dummy-load';
import { attenuatorPad } from '../../domain/attenuator';
import { coaxLineLoss, lineLossWithSwr } from '../../domain/line-loss';
import { capacitorDischarge } from '../../domain/discharge';
import { attenuatorQuery, dcDropQuery, dischargeQuery, dummyLoadQuery, levelQuery, lineLossQuery, rfQuery, xmodemQuery } from './calc.schemas';

export const calcRouter = Router();

calcRouter.get('/xmodem', (req, res) => {
  res.json(planXmodemTransfer(parseInput(xmodemQuery, req.query)));
});

calcRouter.get('/rf', (req, res) => {
  const q = parseInput(rfQuery, req.query);
  res.json(rfFigures(q.forwardW, q.reflectedW));
});

calcRouter.get('/dc-drop', (req, res) => {
  const q = parseInput(dcDropQuery, req.query);
  const gauge = (q.awg !== undefined ? { awg: q.awg } : { mm2: q.mm2 }) as LeadGauge;
  res.json(
    dcLeadDrop({
      currentA: q.currentA,
      lengthM: q.lengthM,
      gauge,
      supplyV: q.supplyV,
      nominalV: q.nominalV,
      tolerancePct: q.tolerancePct,
      conductorC: q.conductorC,
    }),
  );
});

calcRouter.get('/level', (req, res) => {
  const q = parseInput(levelQuery, req.query);
  res.json(signalLevel(q.value, q.unit, q.ohms, q.band));
});

calcRouter.get('/dummy-load', (req, res) => {
  const q = parseInput(dummyLoadQuery, req.query);
  res.json(dummyLoadFigures(q.watts, q.ohms));
});

calcRouter.get('/attenuator', (req, res) => {
  const q = parseInput(attenuatorQuery, req.query);
  res.json(attenuatorPad(q.db, q.ohms, q.shape, q.inputW));
});

calcRouter.get('/line-loss', (req, res) => {
  const q = parseInput(lineLossQuery, req.query);
  res.json(q.cable !== undefined ? coaxLineLoss(q.cable, q.lengthM!, q.mhz!, q.swr) : lineLossWithSwr(q.matchedLossDb!, q.swr));
});

calcRouter.get('/discharge', (req, res) => {
  const q = parseInput(dischargeQuery, req.query);
  res.json(capacitorDischarge(q.volts, q.farads, q.ohms, q.safeVolts));
});
