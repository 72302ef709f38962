#!/usr/bin/env node
// Draws the add-in icons (assets/icon-<size>.png): a sine wave entering from
// the left that fades, cell by cell, into bars of shrinking height — a wave
// dying out in a graded absorber. Pure Node (zlib), no image libraries.
// Usage: node scripts/make-icons.js [outDir]
'use strict';
const fs = require('fs');
const path = require('path');
const zlib = require('zlib');

const SIZES = [16, 32, 64, 80, 128];
const BACKGROUND = [0x1f, 0x3a, 0x5f]; // deep blue tile
const WAVE = [0x7f, 0xd8, 0xff]; // light cyan
const BAR = [0xff, 0xc8, 0x57]; // amber

const CRC_TABLE = new Uint32Array(256).map((_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});

function crc32(buf) {
  let c = 0xffffffff;
  for (const b of buf) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type, data) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([len, body, crc]);
}

/** Encodes an RGBA pixel buffer (width × height × 4) as a PNG. */
function encodePng(width, height, rgba) {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  header[8] = 8; // bit depth
  header[9] = 6; // colour type RGBA
  const raw = Buffer.alloc((width * 4 + 1) * height);
  for (let y = 0; y < height; y++) {
    raw[y * (width * 4 + 1)] = 0; // filter: none
    rgba.copy(raw, y * (width * 4 + 1) + 1, y * width * 4, (y + 1) * width * 4);
  }
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', header),
    chunk('IDAT', zlib.deflateSync(raw, { level: 9 })),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

/** Coverage in [0, 1] of pixel (px, py) by the icon's shapes, sampled 4×4 per pixel for smooth edges. */
function drawIcon(size) {
  const rgba = Buffer.alloc(size * size * 4);
  const S = 4;
  const radius = 0.18; // rounded tile corners, as a fraction of the size
  const split = 0.5; // the wave occupies the left half, the bars the right half
  const bars = 4;
  for (let py = 0; py < size; py++) {
    for (let px = 0; px < size; px++) {
      let tile = 0;
      let wave = 0;
      let bar = 0;
      for (let sy = 0; sy < S; sy++) {
        for (let sx = 0; sx < S; sx++) {
          const x = (px + (sx + 0.5) / S) / size; // 0..1
          const y = (py + (sy + 0.5) / S) / size;
          const cx = Math.min(Math.max(x, radius), 1 - radius);
          const cy = Math.min(Math.max(y, radius), 1 - radius);
          const inTile = (x - cx) ** 2 + (y - cy) ** 2 <= radius * radius;
          if (!inTile) continue;
          tile++;
          const thickness = Math.max(0.045, 1.6 / size);
          if (x >= 0.1 && x <= split + 0.02) {
            // Sine of two periods over the left half, amplitude fading towards the absorber.
            const u = (x - 0.1) / (split - 0.1);
            const amp = 0.26 * (1 - 0.55 * u);
            const yw = 0.5 - amp * Math.sin(2 * Math.PI * 1.5 * u);
            if (Math.abs(y - yw) <= thickness) wave++;
          }
          if (x > split + 0.04 && x < 0.92) {
            // Bars of falling height: what is left of the wave in each absorber cell.
            const w = (0.92 - (split + 0.04)) / bars;
            const k = Math.floor((x - (split + 0.04)) / w);
            const inBar = x - (split + 0.04) - k * w < 0.68 * w;
            const h = 0.5 * Math.pow(0.6, k);
            if (inBar && Math.abs(y - 0.5) <= h / 2 + thickness / 2) bar++;
          }
        }
      }
      const n = S * S;
      const o = (py * size + px) * 4;
      const fw = wave / n;
      const fb = bar / n;
      const fbg = 1 - fw - fb;
      for (let c = 0; c < 3; c++) {
        rgba[o + c] = Math.round(BACKGROUND[c] * fbg + WAVE[c] * fw + BAR[c] * fb);
      }
      rgba[o + 3] = Math.round((255 * tile) / n);
    }
  }
  return encodePng(size, size, rgba);
}

function main() {
  const outDir = path.resolve(process.argv[2] || path.join(__dirname, '..', 'assets'));
  fs.mkdirSync(outDir, { recursive: true });
  for (const size of SIZES) {
    const file = path.join(outDir, `icon-${size}.png`);
    fs.writeFileSync(file, drawIcon(size));
    console.log(`wrote ${path.relative(process.cwd(), file)}`);
  }
}

if (require.main === module) main();
module.exports = { drawIcon, encodePng, SIZES };
