// Draws the app icon (a pressure-flow staircase on a dark tile) as SVG and
// as PNG at 192 and 512 px, plus a full-bleed maskable PNG. The shapes are
// rectangles, so the PNGs are rasterised here (4×4 supersampling) and
// written with node's zlib: no image tools needed.
// Usage: node scripts/make-icons.mjs   (writes public/icons/)
import { writeFileSync, mkdirSync } from 'node:fs';
import { deflateSync } from 'node:zlib';

const OUT = new URL('../public/icons/', import.meta.url);
const BG = [0x17, 0x32, 0x4d];
const STEP = [0xf2, 0xa9, 0x00];
const LINE = [0xff, 0xff, 0xff];
// On a 512 grid: [x0, y0, x1, y1, colour].
const SHAPES = [
  [112, 136, 236, 408, STEP], // both pumps: the high step
  [236, 300, 392, 408, STEP], // small pump only: the low step
  [96, 104, 110, 424, LINE], // flow axis
  [96, 410, 424, 424, LINE], // pressure axis
];
const RADIUS = 96;

function svg() {
  const rects = SHAPES.map(([x0, y0, x1, y1, c]) =>
    `<rect x="${x0}" y="${y0}" width="${x1 - x0}" height="${y1 - y0}" fill="${hex(c)}"/>`).join('');
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 512 512">` +
    `<rect width="512" height="512" rx="${RADIUS}" fill="${hex(BG)}"/>${rects}</svg>\n`;
}

function hex(c) {
  return '#' + c.map((v) => v.toString(16).padStart(2, '0')).join('');
}

// Colour at a point of the 512 grid, or null outside the tile.
function sample(x, y, { rounded, scale }) {
  if (rounded) {
    const cx = Math.min(Math.max(x, RADIUS), 512 - RADIUS);
    const cy = Math.min(Math.max(y, RADIUS), 512 - RADIUS);
    if ((x - cx) ** 2 + (y - cy) ** 2 > RADIUS ** 2) return null;
  }
  // Content scaled about the centre (maskable icons keep to a safe circle).
  const u = 256 + (x - 256) / scale;
  const v = 256 + (y - 256) / scale;
  let col = BG;
  for (const [x0, y0, x1, y1, c] of SHAPES) {
    if (u >= x0 && u < x1 && v >= y0 && v < y1) col = c;
  }
  return col;
}

function raster(size, opts) {
  const px = Buffer.alloc(size * (size * 4 + 1));
  const n = 4;
  for (let j = 0; j < size; j++) {
    px[j * (size * 4 + 1)] = 0; // filter: none
    for (let i = 0; i < size; i++) {
      let r = 0, g = 0, b = 0, a = 0;
      for (let sj = 0; sj < n; sj++) {
        for (let si = 0; si < n; si++) {
          const x = ((i + (si + 0.5) / n) * 512) / size;
          const y = ((j + (sj + 0.5) / n) * 512) / size;
          const c = sample(x, y, opts);
          if (c) { r += c[0]; g += c[1]; b += c[2]; a += 1; }
        }
      }
      const o = j * (size * 4 + 1) + 1 + i * 4;
      px[o] = a ? Math.round(r / a) : 0;
      px[o + 1] = a ? Math.round(g / a) : 0;
      px[o + 2] = a ? Math.round(b / a) : 0;
      px[o + 3] = Math.round((255 * a) / (n * n));
    }
  }
  return png(size, size, px);
}

const CRC = new Uint32Array(256).map((_, k) => {
  let c = k;
  for (let i = 0; i < 8; i++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
function crc32(buf) {
  let c = 0xffffffff;
  for (const b of buf) c = CRC[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
function chunk(type, data) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const td = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(td));
  return Buffer.concat([len, td, crc]);
}
// PNG (ISO/IEC 15948): signature, IHDR, IDAT, IEND; 8-bit RGBA.
function png(w, h, raw) {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(w, 0);
  ihdr.writeUInt32BE(h, 4);
  ihdr[8] = 8;
  ihdr[9] = 6;
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(raw, { level: 9 })),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

mkdirSync(OUT, { recursive: true });
writeFileSync(new URL('icon.svg', OUT), svg());
writeFileSync(new URL('icon-192.png', OUT), raster(192, { rounded: true, scale: 1 }));
writeFileSync(new URL('icon-512.png', OUT), raster(512, { rounded: true, scale: 1 }));
writeFileSync(new URL('icon-maskable-512.png', OUT), raster(512, { rounded: false, scale: 0.72 }));
console.log('icons: wrote public/icons/{icon.svg,icon-192.png,icon-512.png,icon-maskable-512.png}');
