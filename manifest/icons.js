/**
 * Draws Lift Ledger's icons (a green tile with three rising bars) as PNG bytes, so the repository holds
 * no binary images. Used by webpack.config.js (emits dist/assets/icon-<size>.png) and by
 * `node manifest/icons.js <dir>` to write the files by hand.
 *
 * PNG layout per the W3C PNG specification (2nd ed.): signature, IHDR, one zlib-compressed IDAT of
 * filter-0 scanlines, IEND; each chunk closed by a CRC-32 of its type and data.
 */
'use strict';
const zlib = require('zlib');
const fs = require('fs');
const path = require('path');

/** The sizes the manifest refers to. */
const ICON_SIZES = [16, 32, 64, 80];

const CRC_TABLE = (() => {
  const table = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    table[n] = c >>> 0;
  }
  return table;
})();

/** CRC-32 (ISO 3309) of a buffer. */
function crc32(buffer) {
  let c = 0xffffffff;
  for (const byte of buffer) c = CRC_TABLE[(c ^ byte) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type, data) {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

/** RGBA colour of pixel (x, y) of a size × size icon. */
function pixel(x, y, size) {
  const u = (x + 0.5) / size;
  const v = (y + 0.5) / size;
  const radius = 0.18;
  const cx = Math.min(Math.max(u, radius), 1 - radius);
  const cy = Math.min(Math.max(v, radius), 1 - radius);
  const outside = (u - cx) ** 2 + (v - cy) ** 2 > radius * radius;
  if (outside) return [0, 0, 0, 0];
  // three rising bars, white on green
  const bars = [
    { left: 0.2, right: 0.36, top: 0.58 },
    { left: 0.42, right: 0.58, top: 0.42 },
    { left: 0.64, right: 0.8, top: 0.24 },
  ];
  const inBar = bars.some((b) => u >= b.left && u < b.right && v >= b.top && v < 0.8);
  return inBar ? [255, 255, 255, 255] : [46, 125, 50, 255];
}

/**
 * PNG bytes of the icon at `size` pixels square (8-bit RGBA).
 * @param {number} size
 * @returns {Buffer}
 * @example drawIcon(16).subarray(1, 4).toString() //=> 'PNG'
 */
function drawIcon(size) {
  const raw = Buffer.alloc(size * (1 + size * 4));
  for (let y = 0; y < size; y++) {
    const row = y * (1 + size * 4);
    raw[row] = 0; // filter type 0 (none)
    for (let x = 0; x < size; x++) {
      const [r, g, b, a] = pixel(x, y, size);
      raw.set([r, g, b, a], row + 1 + x * 4);
    }
  }
  const header = Buffer.alloc(13);
  header.writeUInt32BE(size, 0);
  header.writeUInt32BE(size, 4);
  header[8] = 8; // bit depth
  header[9] = 6; // colour type RGBA
  header[10] = 0; // compression
  header[11] = 0; // filter
  header[12] = 0; // no interlace
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', header),
    chunk('IDAT', zlib.deflateSync(raw, { level: 9 })),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

module.exports = { ICON_SIZES, drawIcon, crc32 };

if (require.main === module) {
  const dir = process.argv[2] || path.join(__dirname, '..', 'dist', 'assets');
  fs.mkdirSync(dir, { recursive: true });
  for (const size of ICON_SIZES) fs.writeFileSync(path.join(dir, `icon-${size}.png`), drawIcon(size));
  console.log(`wrote ${ICON_SIZES.length} icons to ${dir}`);
}
