/**
 * Files for the upload tests, built byte by byte (not a test file itself). Each carries only what its
 * format's header needs for type sniffing and dimensions: a type's magic bytes and its size fields.
 */
import zlib from 'node:zlib';

const u32 = (n: number) => {
  const b = Buffer.alloc(4);
  b.writeUInt32BE(n);
  return b;
};

function pngChunk(type: string, data: Buffer): Buffer {
  const td = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  return Buffer.concat([u32(data.length), td, u32(zlib.crc32(td))]);
}

/** A real PNG (PNG spec: signature, IHDR, IDAT, IEND), 8-bit RGB. `claim` overrides the IHDR size only. */
export function png(width: number, height: number, claim?: { width: number; height: number }): Buffer {
  const raw = Buffer.alloc((width * 3 + 1) * height, 0x80);
  for (let y = 0; y < height; y++) raw[y * (width * 3 + 1)] = 0; // filter byte: none
  const ihdr = Buffer.concat([u32(claim?.width ?? width), u32(claim?.height ?? height), Buffer.from([8, 2, 0, 0, 0])]);
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    pngChunk('IDAT', zlib.deflateSync(raw)),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

/** A baseline JPEG header (JFIF APP0, SOF0 with the size) and EOI; enough for sniffing and dimensions. */
export function jpeg(width: number, height: number): Buffer {
  const app0 = Buffer.from([0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0x00, 0x01, 0x00, 0x01, 0x00, 0x00]);
  const sof0 = Buffer.from([0xff, 0xc0, 0x00, 0x11, 0x08, height >> 8, height & 0xff, width >> 8, width & 0xff, 0x03, 0x01, 0x22, 0x00, 0x02, 0x11, 0x01, 0x03, 0x11, 0x01]);
  return Buffer.concat([Buffer.from([0xff, 0xd8]), app0, sof0, Buffer.from([0xff, 0xd9])]);
}

/** A lossless WebP (RIFF "WEBP", VP8L chunk: signature 0x2f, 14-bit width−1 and height−1). */
export function webp(width: number, height: number): Buffer {
  const bits = ((width - 1) & 0x3fff) | (((height - 1) & 0x3fff) << 14);
  const vp8l = Buffer.concat([Buffer.from([0x2f]), Buffer.from([bits & 0xff, (bits >> 8) & 0xff, (bits >> 16) & 0xff, (bits >> 24) & 0xff]), Buffer.alloc(6)]);
  const chunk = Buffer.concat([Buffer.from('VP8L', 'latin1'), Buffer.from([vp8l.length, 0, 0, 0]), vp8l]);
  const body = Buffer.concat([Buffer.from('WEBP', 'latin1'), chunk]);
  const size = Buffer.alloc(4);
  size.writeUInt32LE(body.length);
  return Buffer.concat([Buffer.from('RIFF', 'latin1'), size, body]);
}

/** A one-page PDF: header, catalog, pages, page, xref and trailer, %%EOF (ISO 32000-1 §7.5). */
export function pdf(text = 'Data sheet'): Buffer {
  return Buffer.from(
    `%PDF-1.4\n1 0 obj <</Type /Catalog /Pages 2 0 R>> endobj\n2 0 obj <</Type /Pages /Kids [3 0 R] /Count 1>> endobj\n3 0 obj <</Type /Page /Parent 2 0 R /MediaBox [0 0 200 100]>> endobj\n% ${text}\nxref\n0 4\n0000000000 65535 f \ntrailer <</Size 4 /Root 1 0 R>>\nstartxref\n0\n%%EOF\n`,
    'latin1',
  );
}

/** An ELF executable header (System V ABI: 0x7f "ELF", 64-bit, little-endian, x86-64). */
export function elf(): Buffer {
  const b = Buffer.alloc(128);
  Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0x02, 0x01, 0x01, 0x00]).copy(b);
  b.writeUInt16LE(2, 16); // ET_EXEC
  b.writeUInt16LE(0x3e, 18); // x86-64
  return b;
}

/** A DOS/PE executable header ("MZ", e_lfanew pointing at "PE\0\0"). */
export function mz(): Buffer {
  const b = Buffer.alloc(256);
  b.write('MZ', 0, 'latin1');
  b.writeUInt32LE(0x80, 0x3c);
  b.write('PE\0\0', 0x80, 'latin1');
  return b;
}

/** A ZIP archive with one stored (uncompressed) entry (PKWARE APPNOTE 4.3). */
export function zip(): Buffer {
  const name = Buffer.from('photo.jpg', 'latin1');
  const data = jpeg(10, 10);
  const local = Buffer.alloc(30);
  local.writeUInt32LE(0x04034b50, 0);
  local.writeUInt16LE(20, 4);
  local.writeUInt32LE(zlib.crc32(data), 14);
  local.writeUInt32LE(data.length, 18);
  local.writeUInt32LE(data.length, 22);
  local.writeUInt16LE(name.length, 26);
  return Buffer.concat([local, name, data]);
}

/** A gzip stream (RFC 1952) of a PDF. */
export function gzippedPdf(): Buffer {
  return zlib.gzipSync(pdf());
}

export const svg = () => Buffer.from('<?xml version="1.0"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><script>alert(1)</script></svg>\n');
export const html = () => Buffer.from('<!DOCTYPE html><html><body><script>fetch("/api/auth/me")</script></body></html>\n');

/** A multipart/form-data body with one file part, built by hand so the file name goes out exactly as given. */
export function multipart(fileName: string, bytes: Buffer, contentType = 'application/octet-stream', field = 'file'): { body: Buffer; type: string } {
  const boundary = `----bankwright-test-${Math.random().toString(16).slice(2)}`;
  const head = Buffer.from(
    `--${boundary}\r\nContent-Disposition: form-data; name="${field}"; filename="${fileName.replace(/"/g, '%22')}"\r\nContent-Type: ${contentType}\r\n\r\n`,
    'utf8',
  );
  return { body: Buffer.concat([head, bytes, Buffer.from(`\r\n--${boundary}--\r\n`)]), type: `multipart/form-data; boundary=${boundary}` };
}

/** A ZIP whose one entry is a deflated "[Content_Types].xml": what a naive sniffer inflates to call it an office document. */
export function officeZip(): Buffer {
  const name = Buffer.from('[Content_Types].xml', 'latin1');
  const xml = Buffer.from('<Types><Override ContentType="application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml"/></Types>');
  const data = zlib.deflateRawSync(xml);
  const local = Buffer.alloc(30);
  local.writeUInt32LE(0x04034b50, 0);
  local.writeUInt16LE(20, 4);
  local.writeUInt16LE(8, 8); // deflate
  local.writeUInt32LE(zlib.crc32(xml), 14);
  local.writeUInt32LE(data.length, 18);
  local.writeUInt32LE(xml.length, 22);
  local.writeUInt16LE(name.length, 26);
  return Buffer.concat([local, name, data]);
}
