// Permissions-Policy: browser features the app does not use are switched off, for its pages and
// anything they might embed. helmet 8 does not set this header.
import type { NextFunction, Request, Response } from 'express';

/**
 * Browser features the app does not use are switched off for its pages and anything they embed;
 * Web Serial stays on for our own origin (the Flasher talks to a radio's bootloader through it).
 * Names are those Chromium recognises (W3C Permissions Policy; MDN's directive list); an unknown name
 * only earns a console warning ("Unrecognized feature"), so `bluetooth` is left out.
 */
export const PERMISSIONS_POLICY = [
  'accelerometer=()',
  'autoplay=()',
  'browsing-topics=()',
  'camera=()',
  'display-capture=()',
  'encrypted-media=()',
  'fullscreen=()',
  'geolocation=()',
  'gyroscope=()',
  'hid=()',
  'idle-detection=()',
  'magnetometer=()',
  'microphone=()',
  'midi=()',
  'payment=()',
  'picture-in-picture=()',
  'publickey-credentials-get=()',
  'screen-wake-lock=()',
  'serial=(self)',
  'sync-xhr=()',
  'usb=()',
  'xr-spatial-tracking=()',
].join(', ');

export function permissionsPolicy(_req: Request, res: Response, next: NextFunction): void {
  res.setHeader('Permissions-Policy', PERMISSIONS_POLICY);
  next();
}
