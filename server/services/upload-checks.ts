/**
 * What an uploaded file is, from its bytes only: the client's file name and Content-Type are never
 * trusted. Nothing here decompresses anything — ZIP and gzip containers are recognised by their magic
 * bytes and refused before file-type would look inside them; image dimensions come from the header
 * (image-size) without decoding pixels. docs/decisions/008-uploads-storage.md.
 */
import { FileTypeParser, type Detector } from 'file-type';
import { imageSize } from 'image-size';
import { UPLOAD_LIMITS, UPLOAD_TYPES, type UploadContentType } from '../../shared/schemas/uploads';
import { DomainError, unprocessable } from './errors';


/**
 * Containers file-type would open to look inside (it inflates ZIP entries and gzip streams to tell
 * e.g. an office document from a plain archive). Answer first, from the magic bytes, so it never does.
 */
const containerGuard: Detector = {
  id: 'bankwright.container-guard',
  async detect(tokenizer) {
    const head = new Uint8Array(4);
    const n = await tokenizer.peekBuffer(head, { length: 4, mayBeLess: true });
    if (n >= 4 && head[0] === 0x50 && head[1] === 0x4b && [0x03, 0x05, 0x07].includes(head[2]!) && head[3] === head[2]! + 1) {
      return { ext: 'zip', mime: 'application/zip' }; // PKWARE APPNOTE: local file header / end of central directory / spanning marker
    }
    if (n >= 2 && head[0] === 0x1f && head[1] === 0x8b) return { ext: 'gz', mime: 'application/gzip' }; // RFC 1952 ID1 ID2
    return undefined;
  },
};

const parser = new FileTypeParser({ customDetectors: [containerGuard] });

export interface SniffedFile {
  contentType: UploadContentType;
  ext: string;
  width: number | null;
  height: number | null;
}

function unsupported(detected: string, message: string): DomainError {
  return new DomainError('unsupported', 'unsupported_type', message, { detected, allowed: Object.keys(UPLOAD_TYPES) });
}

/** A name for bytes file-type does not know: markup (HTML, SVG, XML) or plain text is worth naming. */
function describeUnknown(bytes: Uint8Array): string {
  const head = new TextDecoder('utf-8', { fatal: false }).decode(bytes.subarray(0, 512)).replace(/^\uFEFF/, '').trimStart().toLowerCase();
  if (head.startsWith('<svg') || (head.startsWith('<?xml') && head.includes('<svg'))) return 'SVG markup';
  if (head.startsWith('<!doctype html') || head.startsWith('<html') || head.startsWith('<script') || head.startsWith('<head') || head.startsWith('<body')) return 'HTML';
  if (head.startsWith('<?xml') || head.startsWith('<')) return 'XML or markup';
  if (/^[\x09\x0a\x0d\x20-\x7e]*$/.test(head)) return 'plain text';
  return 'an unrecognised binary format';
}

const LATIN = new TextDecoder('latin1');

/** A PDF starts with "%PDF-1.x" or "%PDF-2.x" and ends with "%%EOF" (ISO 32000-1 §7.5.2, §7.5.5); readers tolerate trailing bytes. */
function looksLikeWholePdf(bytes: Uint8Array): boolean {
  if (!/^%PDF-[12]\.\d/.test(LATIN.decode(bytes.subarray(0, 8)))) return false;
  return LATIN.decode(bytes.subarray(Math.max(0, bytes.length - 2048))).includes('%%EOF');
}

const IMAGE_SIZE_TYPE: Record<string, UploadContentType> = { jpg: 'image/jpeg', png: 'image/png', webp: 'image/webp' };

/**
 * The file's type from its bytes, checked: one of UPLOAD_TYPES, a whole PDF, an image whose header
 * agrees with its magic bytes and whose dimensions are inside the pixel limits. Throws 415
 * unsupported_type / 422 image_too_large / 422 invalid_file with a message naming what was found.
 */
export async function sniffUpload(bytes: Uint8Array): Promise<SniffedFile> {
  if (bytes.length === 0) throw unprocessable('invalid_file', 'The file is empty.');
  const found = await parser.fromBuffer(bytes);
  if (!found) {
    const what = describeUnknown(bytes);
    throw unsupported(what, `This file's content is ${what}, not a PDF, JPEG, PNG or WebP. Only data sheets (PDF) and photos (JPEG, PNG, WebP) can be attached.`);
  }
  if (!(found.mime in UPLOAD_TYPES)) {
    const markup = found.mime === 'application/xml' || found.mime.startsWith('text/') ? describeUnknown(bytes) : null;
    const what = markup === 'SVG markup' || markup === 'HTML' ? markup : `${found.mime} (.${found.ext})`;
    throw unsupported(
      what,
      `This file's content is ${what}, whatever its name says. Only data sheets (PDF) and photos (JPEG, PNG, WebP) can be attached.`,
    );
  }
  const contentType = found.mime as UploadContentType;
  const { ext } = UPLOAD_TYPES[contentType];

  if (contentType === 'application/pdf') {
    if (!looksLikeWholePdf(bytes)) throw unprocessable('invalid_file', 'The file starts like a PDF but is not a whole PDF (no end-of-file marker). Save or export it again and retry.');
    return { contentType, ext, width: null, height: null };
  }

  let dims: { width?: number; height?: number; type?: string };
  try {
    dims = imageSize(bytes);
  } catch {
    throw unprocessable('invalid_file', `The ${UPLOAD_TYPES[contentType].label} image header cannot be read; the file may be damaged.`);
  }
  if (!dims.type || IMAGE_SIZE_TYPE[dims.type] !== contentType || !dims.width || !dims.height) {
    throw unprocessable('invalid_file', `The ${UPLOAD_TYPES[contentType].label} image header cannot be read; the file may be damaged.`);
  }
  const { width, height } = dims;
  const { maxImageSide, maxImagePixels } = UPLOAD_LIMITS;
  if (width > maxImageSide || height > maxImageSide || width * height > maxImagePixels) {
    throw unprocessable(
      'image_too_large',
      `The image claims ${width} × ${height} pixels; photos may be at most ${maxImageSide} pixels a side and ${maxImagePixels / 1e6} megapixels. Scale it down and retry.`,
      { width, height, maxSide: maxImageSide, maxPixels: maxImagePixels },
    );
  }
  return { contentType, ext, width, height };
}

const CONTROL = /[\u0000-\u001f\u007f-\u009f\u200b-\u200f\u202a-\u202e\u2066-\u2069\ufeff]/g;
/** Reserved on Windows, macOS or in URLs and headers. */
const RESERVED = /[<>:"/\\|?*;%#\u0060]/g;
const WINDOWS_DEVICE = /^(con|prn|aux|nul|com[0-9]|lpt[0-9])$/i;

/**
 * A file name safe to store, list and offer for download: the last path segment only (either slash),
 * no control, bidi or reserved characters, no leading dots or `..`, no Windows device names, at most
 * UPLOAD_LIMITS.maxFileNameLength characters, and the extension of the type sniffed from the bytes
 * (so "report.pdf.exe" that is really a PDF becomes "report.pdf.exe.pdf"; "photo.jpeg" stays).
 */
export function sanitizeFileName(raw: string, ext: string): string {
  // A lone surrogate becomes U+FFFD first (the input rules of shared/schemas/text.ts): the name must be storable.
  let name = (raw as string & { toWellFormed(): string }).toWellFormed().normalize('NFC').replace(CONTROL, '');
  name = name.split(/[/\\]/).pop() ?? '';
  name = name.replace(RESERVED, '_').replace(/\s+/g, ' ').trim();
  name = name.replace(/\.{2,}/g, '.').replace(/^[.\s_-]+/, '').replace(/[.\s]+$/, '');
  const dot = name.lastIndexOf('.');
  let stem = dot > 0 ? name.slice(0, dot) : name;
  const current = dot > 0 ? name.slice(dot + 1).toLowerCase() : '';
  const sameType = current === ext || (ext === 'jpg' && (current === 'jpeg' || current === 'jpe'));
  if (!sameType && current) stem = name; // keep the misleading extension visible, then add the real one
  const extension = sameType ? current : ext;
  stem = stem.replace(/[.\s]+$/, '');
  if (!stem || WINDOWS_DEVICE.test(stem.split('.')[0]!)) stem = `file${stem ? `-${stem}` : ''}`;
  const room = UPLOAD_LIMITS.maxFileNameLength - extension.length - 1;
  // Cut by code points so a surrogate pair is never split.
  stem = Array.from(stem).slice(0, room).join('').trim();
  return `${stem}.${extension}`;
}
