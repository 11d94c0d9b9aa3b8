/**
 * Project uploads: data sheets (PDF) and site photos (JPEG, PNG, WebP). The server sniffs the type
 * from the bytes; these constants are what it accepts, and what the client offers in its file picker.
 */
export const UPLOAD_TYPES = {
  'application/pdf': { ext: 'pdf', label: 'PDF', image: false },
  'image/jpeg': { ext: 'jpg', label: 'JPEG', image: true },
  'image/png': { ext: 'png', label: 'PNG', image: true },
  'image/webp': { ext: 'webp', label: 'WebP', image: true },
} as const;
export type UploadContentType = keyof typeof UPLOAD_TYPES;
export const UPLOAD_CONTENT_TYPES = Object.keys(UPLOAD_TYPES) as UploadContentType[];

export const UPLOAD_LIMITS = {
  /** Default size limit; the server's UPLOAD_MAX_MB sets the real one. */
  defaultMaxMb: 20,
  /** Decompression-bomb guard: an image whose header claims more is refused unread. */
  maxImagePixels: 100_000_000,
  maxImageSide: 20_000,
  maxFileNameLength: 120,
} as const;

/** The `accept` attribute of the file picker. */
export const UPLOAD_ACCEPT = '.pdf,.jpg,.jpeg,.png,.webp,application/pdf,image/jpeg,image/png,image/webp';

export interface UploadRecord {
  id: string;
  projectId: string;
  fileName: string;
  contentType: UploadContentType;
  size: number;
  width: number | null;
  height: number | null;
  uploadedBy: { id: string; name: string } | null;
  createdAt: string;
  /** GET this to download (PDF) or show (image). */
  contentUrl: string;
}

export const isImageType = (t: string): boolean => t in UPLOAD_TYPES && UPLOAD_TYPES[t as UploadContentType].image;
