// Ticket photos (intake condition photos and repair photos): the shapes of /api/tickets/:tag/photos.
export const PHOTO_STAGES = ['intake', 'repair'] as const;
export type PhotoStage = (typeof PHOTO_STAGES)[number];

/** One photo of `GET /api/tickets/:tag/photos` and the answer of its POST. */
export interface TicketPhoto {
  id: number;
  stage: PhotoStage;
  /** The uploader's file name, sanitised, for display only (the stored name is generated). */
  name: string;
  mime: 'image/jpeg' | 'image/png' | 'image/webp';
  size: number;
  width: number;
  height: number;
  uploadedBy: string | null;
  at: string;
  /** Where to fetch the photo (full size) and its thumbnail (WebP, at most 320 px). */
  url: string;
  thumbnailUrl: string;
}
