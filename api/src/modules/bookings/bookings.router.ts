// /api/bookings: the day's slots, members' bookings, "Tonight at the bench", calendar feeds.
// Thin handlers: parse at the edge, call a service, send the result. Literal paths come before
// /:bookingId.
import { Router, type Response } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import {
  bookingIdParam,
  createBookingBody,
  dateQuery,
  feedTokenQuery,
  listBookingsQuery,
  noShowBody,
  optionalDateQuery,
  patchBookingBody,
} from './bookings.schemas';
import { assertOwnBooking, cancelBooking, changeBooking, createBooking, daySchedule, daySlots, getBooking, listMyBookings, markNoShow } from './bookings.service';
import { feedLink, memberFeed, resetFeed, sessionsFeed } from './calendar-feeds';

export type BookingsRouterDeps = Pick<AppDeps, 'sequelize' | 'config'>;

function sendCalendar(res: Response, name: string, body: string) {
  res.setHeader('Content-Type', 'text/calendar; charset=utf-8');
  res.setHeader('Content-Disposition', `inline; filename="${name}"`);
  res.send(body);
}

export function createBookingsRouter(deps: BookingsRouterDeps): Router {
  const router = Router();
  const books = requireRole('member', 'technician', 'admin');
  const bench = requireRole('technician', 'admin');
  const id = (params: unknown) => parseInput(bookingIdParam, params).bookingId;

  // Public and token-guarded feeds (calendar apps cannot sign in).
  router.get('/calendar/sessions.ics', async (_req, res) => {
    sendCalendar(res, 'bench-sessions.ics', await sessionsFeed(deps));
  });
  router.get('/calendar/member.ics', async (req, res) => {
    const { token } = parseInput(feedTokenQuery, req.query);
    sendCalendar(res, 'my-bench-slots.ics', await memberFeed(deps, token));
  });
  router.get('/calendar', requireSignedIn, async (req, res) => {
    res.json(await feedLink(deps, currentUser(req)));
  });
  router.post('/calendar/reset', requireSignedIn, async (req, res) => {
    res.json(await resetFeed(deps, currentUser(req)));
  });

  router.get('/slots', requireSignedIn, async (req, res) => {
    res.json(await daySlots(deps, currentUser(req), parseInput(dateQuery, req.query).date));
  });
  router.get('/schedule', bench, async (req, res) => {
    res.json(await daySchedule(deps, parseInput(optionalDateQuery, req.query).date));
  });

  router.get('/', requireSignedIn, async (req, res) => {
    res.json(await listMyBookings(deps, currentUser(req), parseInput(listBookingsQuery, req.query)));
  });
  router.post('/', books, async (req, res) => {
    res.status(201).json(await createBooking(deps, currentUser(req), parseInput(createBookingBody, req.body)));
  });

  router.get('/:bookingId', requireSignedIn, async (req, res) => {
    res.json(await getBooking(deps, currentUser(req), id(req.params)));
  });
  router.patch('/:bookingId', requireSignedIn, async (req, res) => {
    const bookingId = id(req.params);
    await assertOwnBooking(deps, currentUser(req), bookingId);
    res.json(await changeBooking(deps, currentUser(req), bookingId, parseInput(patchBookingBody, req.body)));
  });
  router.post('/:bookingId/cancel', requireSignedIn, async (req, res) => {
    res.json(await cancelBooking(deps, currentUser(req), id(req.params)));
  });
  router.post('/:bookingId/no-show', bench, async (req, res) => {
    const bookingId = id(req.params);
    res.json(await markNoShow(deps, bookingId, parseInput(noShowBody, req.body).noShow));
  });

  return router;
}
