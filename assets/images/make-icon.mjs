// Draws Fourpoint's mark (ink tile, four brick points, one beat) into icon.png: `node assets/images/make-icon.mjs`.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import zlib from 'node:zlib';

const size = 192;
const ink = [0x12, 0x34, 0x3b];
const brick = [0xc4, 0x51, 0x2f];
const paper = [0xf6, 0xf3, 0xec];
const px = new Uint8Array(size * size * 4);

// Coverage by 4x4 supersampling keeps the edges smooth.
function paint(inside, color) {
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      let hits = 0;
      for (let sy = 0; sy < 4; sy++)
        for (let sx = 0; sx < 4; sx++)
          if (inside((x + (sx + 0.5) / 4) / size, (y + (sy + 0.5) / 4) / size)) hits++;
      if (!hits) continue;
      const a = hits / 16;
      const i = (y * size + x) * 4;
      const base = px[i + 3] / 255;
      for (let c = 0; c < 3; c++) px[i + c] = Math.round(color[c] * a + px[i + c] * (1 - a));
      px[i + 3] = Math.round(255 * (a + base * (1 - a)));
    }
  }
}

const tile = (u, v) => {
  const r = 0.28;
  const dx = Math.max(Math.abs(u - 0.5) - (0.5 - r - 0.02), 0);
  const dy = Math.max(Math.abs(v - 0.5) - (0.5 - r - 0.02), 0);
  return dx * dx + dy * dy <= r * r;
};
const dot = (cx, cy) => (u, v) => (u - cx) ** 2 + (v - cy) ** 2 <= 0.075 ** 2;
const beat = [
  [0.33, 0.5],
  [0.41, 0.5],
  [0.46, 0.39],
  [0.55, 0.61],
  [0.6, 0.5],
  [0.67, 0.5],
];
function nearSegment(u, v, [ax, ay], [bx, by], w) {
  const t = Math.max(
    0,
    Math.min(1, ((u - ax) * (bx - ax) + (v - ay) * (by - ay)) / ((bx - ax) ** 2 + (by - ay) ** 2)),
  );
  return (u - ax - t * (bx - ax)) ** 2 + (v - ay - t * (by - ay)) ** 2 <= w * w;
}

paint(tile, ink);
for (const [cx, cy] of [
  [0.5, 0.23],
  [0.77, 0.5],
  [0.5, 0.77],
  [0.23, 0.5],
])
  paint(dot(cx, cy), brick);
paint((u, v) => beat.slice(1).some((p, i) => nearSegment(u, v, beat[i], p, 0.028)), paper);

function crc32(buf) {
  let c = ~0;
  for (const b of buf) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
  }
  return ~c >>> 0;
}
function chunk(type, data) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([len, body, crc]);
}
const ihdr = Buffer.alloc(13);
ihdr.writeUInt32BE(size, 0);
ihdr.writeUInt32BE(size, 4);
ihdr.set([8, 6, 0, 0, 0], 8);
const raw = Buffer.alloc(size * (size * 4 + 1));
for (let y = 0; y < size; y++)
  Buffer.from(px.buffer, y * size * 4, size * 4).copy(raw, y * (size * 4 + 1) + 1);
const png = Buffer.concat([
  Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
  chunk('IHDR', ihdr),
  chunk('IDAT', zlib.deflateSync(raw, { level: 9 })),
  chunk('IEND', Buffer.alloc(0)),
]);
const out = path.join(path.dirname(fileURLToPath(import.meta.url)), 'icon.png');
fs.writeFileSync(out, png);
console.log(`wrote ${out} (${png.length} bytes)`);
