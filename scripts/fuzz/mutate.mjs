// Structure-aware mutations of PNG, JPEG and TIFF files for the fuzz harness (scripts/fuzz/run.mjs).
// Each format is parsed into its parts (PNG chunks, JPEG marker segments and entropy-coded scans,
// TIFF header / image file directory entries / strip and tile data) and damaged where decoders
// make decisions: sizes, depths, counts, offsets, table ids, lengths, chunk order, compressed
// streams. After a PNG edit the chunk CRC is usually fixed again so the damage reaches the code
// behind the CRC check. Generic byte-level damage (bit flips, truncation, zeroed or repeated
// blocks, splices of two files) is mixed in. Everything is driven by a seeded generator, so a
// failing input is reproduced by its seed and index.
import { deflateSync, inflateSync } from 'node:zlib';

/** mulberry32: small seeded generator (its own, not the product's). */
export function rng(seed) {
  let a = seed >>> 0 || 1;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const r = {
    next,
    int: (n) => Math.floor(next() * n),
    pick: (arr) => arr[Math.floor(next() * arr.length)],
    chance: (p) => next() < p,
    bytes: (n) => Uint8Array.from({ length: n }, () => Math.floor(next() * 256)),
  };
  return r;
}

const INTERESTING_8 = [0, 1, 2, 3, 4, 7, 8, 15, 16, 31, 32, 63, 64, 127, 128, 129, 200, 254, 255];
const INTERESTING_16 = [0, 1, 2, 255, 256, 4095, 4096, 32767, 32768, 65534, 65535];
const INTERESTING_32 = [0, 1, 2, 8, 0x7fff, 0xffff, 0x10000, 0x7fffffff, 0x80000000, 0xfffffffe, 0xffffffff, 100000, 1 << 24];

function concat(parts) {
  const n = parts.reduce((s, p) => s + p.length, 0);
  const out = new Uint8Array(n);
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

const be32 = (v) => new Uint8Array([(v >>> 24) & 255, (v >>> 16) & 255, (v >>> 8) & 255, v & 255]);
const rd32 = (b, o) => ((b[o] << 24) >>> 0) + (b[o + 1] << 16) + (b[o + 2] << 8) + b[o + 3];

// ------------------------------------------------------------------------------- generic
export const GENERIC = {
  bitflip(b, r) {
    const out = b.slice();
    for (let k = 1 + r.int(8); k > 0; k--) {
      const i = r.int(out.length);
      out[i] ^= 1 << r.int(8);
    }
    return out;
  },
  interestingByte(b, r) {
    const out = b.slice();
    out[r.int(out.length)] = r.pick(INTERESTING_8);
    return out;
  },
  truncate(b, r) {
    return b.slice(0, r.int(b.length));
  },
  zeroBlock(b, r) {
    const out = b.slice();
    const at = r.int(out.length);
    out.fill(r.chance(0.5) ? 0 : 0xff, at, at + 1 + r.int(256));
    return out;
  },
  repeatBlock(b, r) {
    const at = r.int(b.length);
    const len = 1 + r.int(Math.min(512, b.length - at));
    const block = b.subarray(at, at + len);
    const times = 1 + r.int(8);
    return concat([b.subarray(0, at + len), ...Array(times).fill(block), b.subarray(at + len)]);
  },
  insertRandom(b, r) {
    const at = r.int(b.length);
    return concat([b.subarray(0, at), r.bytes(1 + r.int(64)), b.subarray(at)]);
  },
  splice(b, r, other) {
    if (!other) return GENERIC.bitflip(b, r);
    const at = r.int(b.length);
    const from = r.int(other.length);
    return concat([b.subarray(0, at), other.subarray(from)]);
  },
};

// ------------------------------------------------------------------------------- PNG
function pngChunks(b) {
  const chunks = [];
  let off = 8;
  while (off + 12 <= b.length) {
    const len = rd32(b, off);
    if (off + 12 + len > b.length) break;
    chunks.push({ type: b.slice(off + 4, off + 8), data: b.slice(off + 8, off + 8 + len), crc: b.slice(off + 8 + len, off + 12 + len) });
    off += 12 + len;
  }
  return { chunks, tail: b.slice(off) };
}

function crc32(bytes) {
  let c = ~0;
  for (const x of bytes) {
    c ^= x;
    for (let k = 0; k < 8; k++) c = c & 1 ? (c >>> 1) ^ 0xedb88320 : c >>> 1;
  }
  return ~c >>> 0;
}

function pngBuild(chunks, tail, r, fixCrc) {
  const parts = [new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])];
  for (const c of chunks) {
    parts.push(be32(c.lenOverride ?? c.data.length), c.type, c.data);
    parts.push(fixCrc ? be32(crc32(concat([c.type, c.data]))) : c.crc);
  }
  parts.push(tail);
  return concat(parts);
}

const typeName = (c) => String.fromCharCode(...c.type);

const PNG = {
  deleteChunk(p, r) {
    if (p.chunks.length > 1) p.chunks.splice(r.int(p.chunks.length), 1);
  },
  duplicateChunk(p, r) {
    const i = r.int(p.chunks.length);
    p.chunks.splice(i + r.int(3), 0, { ...p.chunks[i], data: p.chunks[i].data.slice() });
  },
  swapChunks(p, r) {
    const i = r.int(p.chunks.length);
    const j = r.int(p.chunks.length);
    [p.chunks[i], p.chunks[j]] = [p.chunks[j], p.chunks[i]];
  },
  ihdrField(p, r) {
    const c = p.chunks.find((x) => typeName(x) === 'IHDR');
    if (!c || c.data.length < 13) return;
    const dv = new DataView(c.data.buffer, c.data.byteOffset);
    const f = r.int(7);
    if (f === 0) dv.setUint32(0, r.pick([0, 1, 3, 65535, 100000, 0x7fffffff, 0xffffffff, dv.getUint32(0) + 1 + r.int(4)]) >>> 0);
    else if (f === 1) dv.setUint32(4, r.pick([0, 1, 3, 65535, 100000, 0x7fffffff, 0xffffffff, dv.getUint32(4) + 1 + r.int(4)]) >>> 0);
    else if (f === 2) c.data[8] = r.pick([0, 1, 2, 3, 4, 5, 7, 8, 9, 16, 32, 255]); // bit depth
    else if (f === 3) c.data[9] = r.pick([0, 1, 2, 3, 4, 5, 6, 7, 8, 255]); // colour type
    else c.data[8 + f] = r.pick([0, 1, 2, 255]); // compression, filter, interlace
  },
  lengthField(p, r) {
    const c = r.pick(p.chunks);
    c.lenOverride = r.pick([0, 1, c.data.length - 1, c.data.length + 1, c.data.length + 1000, 0x7fffffff, 0x80000000, 0xffffffff]) >>> 0;
  },
  chunkType(p, r) {
    const c = r.pick(p.chunks);
    c.type = r.chance(0.5) ? r.bytes(4) : Uint8Array.from([r.pick([0, 0x1b, 0x07, 0x9b, 0x41]), r.pick([0, 0x1b, 0x5b, 0x49]), 0x44, r.pick([0x41, 0x52, 0x0d])]);
  },
  insertChunk(p, r) {
    const types = ['tEXt', 'zTXt', 'iCCP', 'sBIT', 'gAMA', 'pHYs', 'tRNS', 'PLTE', 'IDAT', 'IEND', 'acTL', 'iTXt'];
    const t = r.pick(types);
    const data = t === 'pHYs' ? concat([be32(r.pick(INTERESTING_32)), be32(r.pick(INTERESTING_32)), new Uint8Array([r.int(3)])]) : r.bytes(r.int(800));
    p.chunks.splice(1 + r.int(p.chunks.length), 0, { type: new TextEncoder().encode(t), data, crc: new Uint8Array(4) });
  },
  idatRecompress(p, r) {
    const idats = p.chunks.filter((x) => typeName(x) === 'IDAT');
    if (idats.length === 0) return;
    let raw;
    try {
      raw = inflateSync(concat(idats.map((x) => x.data)));
    } catch {
      return;
    }
    const f = r.int(5);
    if (f === 0) raw = raw.subarray(0, r.int(raw.length)); // too little data, valid zlib
    else if (f === 1) raw = concat([raw, r.bytes(1 + r.int(4096))]); // too much
    else if (f === 2) for (let k = 0; k < 1 + r.int(8); k++) raw[r.int(raw.length)] = r.pick([5, 6, 7, 255]); // bad filter types / values
    else if (f === 3) raw = new Uint8Array(raw.length).fill(r.pick([0, 4, 255]));
    else raw = r.bytes(raw.length);
    const z = deflateSync(raw);
    const at = p.chunks.indexOf(idats[0]);
    p.chunks = p.chunks.filter((x) => !idats.includes(x));
    // split into one or several IDAT chunks again
    const n = 1 + r.int(4);
    const step = Math.ceil(z.length / n);
    const parts = [];
    for (let o = 0; o < z.length; o += step) parts.push({ type: idats[0].type, data: z.subarray(o, o + step), crc: new Uint8Array(4) });
    p.chunks.splice(at, 0, ...parts);
  },
  idatFlip(p, r) {
    const idat = p.chunks.find((x) => typeName(x) === 'IDAT');
    if (!idat || idat.data.length === 0) return;
    for (let k = 0; k < 1 + r.int(4); k++) idat.data[r.int(idat.data.length)] ^= 1 << r.int(8);
  },
  paletteSize(p, r) {
    const c = p.chunks.find((x) => typeName(x) === 'PLTE' || typeName(x) === 'tRNS');
    if (!c) return PNG.insertChunk(p, r);
    c.data = c.data.slice(0, r.pick([0, 3, 1, c.data.length - 1, c.data.length - 3]));
  },
  dropIend(p) {
    p.chunks = p.chunks.filter((x) => typeName(x) !== 'IEND');
  },
};

// ------------------------------------------------------------------------------- JPEG
function jpegSegments(b) {
  const segs = [];
  let off = 2;
  while (off + 1 < b.length) {
    if (b[off] !== 0xff) break;
    const code = b[off + 1];
    if (code === 0xd9) {
      segs.push({ code, body: new Uint8Array(0), data: new Uint8Array(0) });
      off += 2;
      break;
    }
    if (code >= 0xd0 && code <= 0xd7) {
      segs.push({ code, body: new Uint8Array(0), data: new Uint8Array(0) });
      off += 2;
      continue;
    }
    const len = (b[off + 2] << 8) | b[off + 3];
    const body = b.slice(off + 4, off + 2 + len);
    off += 2 + len;
    let data = new Uint8Array(0);
    if (code === 0xda) {
      const start = off;
      while (off + 1 < b.length && !(b[off] === 0xff && b[off + 1] !== 0 && !(b[off + 1] >= 0xd0 && b[off + 1] <= 0xd7))) off++;
      data = b.slice(start, off);
    }
    segs.push({ code, body, data });
  }
  return { segs, tail: b.slice(off) };
}

function jpegBuild(p) {
  const parts = [new Uint8Array([0xff, 0xd8])];
  for (const s of p.segs) {
    if (s.code === 0xd9 || (s.code >= 0xd0 && s.code <= 0xd7)) {
      parts.push(new Uint8Array([0xff, s.code]));
      continue;
    }
    const len = s.lenOverride ?? s.body.length + 2;
    parts.push(new Uint8Array([0xff, s.code, (len >> 8) & 255, len & 255]), s.body, s.data);
  }
  parts.push(p.tail);
  return concat(parts);
}

const isSof = (c) => c >= 0xc0 && c <= 0xcf && c !== 0xc4 && c !== 0xc8 && c !== 0xcc;

const JPEG = {
  deleteSegment(p, r) {
    if (p.segs.length > 1) p.segs.splice(r.int(p.segs.length), 1);
  },
  duplicateSegment(p, r) {
    const i = r.int(p.segs.length);
    p.segs.splice(i + r.int(3), 0, { ...p.segs[i], body: p.segs[i].body.slice(), data: p.segs[i].data.slice() });
  },
  swapSegments(p, r) {
    const i = r.int(p.segs.length);
    const j = r.int(p.segs.length);
    [p.segs[i], p.segs[j]] = [p.segs[j], p.segs[i]];
  },
  sofField(p, r) {
    const s = p.segs.find((x) => isSof(x.code));
    if (!s || s.body.length < 6) return;
    const f = r.int(6);
    if (f === 0) s.body[0] = r.pick([0, 1, 8, 12, 16, 255]); // precision
    else if (f === 1 || f === 2) {
      const v = r.pick(INTERESTING_16);
      s.body[f === 1 ? 1 : 3] = v >> 8;
      s.body[f === 1 ? 2 : 4] = v & 255;
    } else if (f === 3) s.body[5] = r.pick([0, 1, 2, 3, 4, 5, 255]); // components
    else if (f === 4 && s.body.length > 7) s.body[7 + 3 * r.int(Math.max(1, (s.body.length - 6) / 3))] = r.pick([0x00, 0x11, 0x22, 0x44, 0x15, 0x51, 0xff]); // sampling
    else if (s.body.length > 8) s.body[8 + 3 * r.int(Math.max(1, (s.body.length - 6) / 3))] = r.pick([0, 1, 3, 4, 255]); // quant table id
  },
  sofKind(p, r) {
    const s = p.segs.find((x) => isSof(x.code));
    if (s) s.code = r.pick([0xc0, 0xc1, 0xc2, 0xc3, 0xc5, 0xc9, 0xca, 0xcb, 0xcf]);
  },
  dhtField(p, r) {
    const s = p.segs.find((x) => x.code === 0xc4);
    if (!s || s.body.length < 17) return;
    const f = r.int(3);
    if (f === 0) s.body[0] = r.pick([0x00, 0x01, 0x10, 0x11, 0x04, 0x14, 0x20, 0xff]); // class / id
    else if (f === 1) s.body[1 + r.int(16)] = r.pick([0, 1, 2, 16, 200, 255]); // code counts
    else s.body = s.body.slice(0, 1 + r.int(s.body.length));
  },
  dqtField(p, r) {
    const s = p.segs.find((x) => x.code === 0xdb);
    if (!s || s.body.length < 2) return;
    if (r.chance(0.5)) s.body[0] = r.pick([0x00, 0x01, 0x03, 0x04, 0x10, 0x13, 0xff]);
    else s.body[1 + r.int(s.body.length - 1)] = r.pick([0, 1, 255]);
  },
  sosField(p, r) {
    const s = p.segs.find((x) => x.code === 0xda);
    if (!s || s.body.length < 4) return;
    const n = s.body.length;
    const f = r.int(4);
    if (f === 0) s.body[0] = r.pick([0, 1, 2, 3, 4, 255]); // components in scan
    else if (f === 1) s.body[2 + 2 * r.int(Math.max(1, (n - 4) / 2))] = r.pick([0x00, 0x11, 0x44, 0xff]); // table ids
    else s.body[n - 3 + r.int(3)] = r.pick([0, 1, 5, 63, 64, 0x10, 0x21, 0xff]); // Ss, Se, Ah/Al
  },
  lengthField(p, r) {
    const s = r.pick(p.segs);
    s.lenOverride = r.pick([0, 1, 2, s.body.length + 1, s.body.length + 3, 0xffff]);
  },
  entropyDamage(p, r) {
    const scans = p.segs.filter((x) => x.code === 0xda && x.data.length > 0);
    if (scans.length === 0) return;
    const s = r.pick(scans);
    const f = r.int(4);
    if (f === 0) for (let k = 0; k < 1 + r.int(8); k++) s.data[r.int(s.data.length)] ^= 1 << r.int(8);
    else if (f === 1) s.data = s.data.slice(0, r.int(s.data.length));
    else if (f === 2) {
      const at = r.int(s.data.length);
      s.data = concat([s.data.subarray(0, at), new Uint8Array([0xff, r.pick([0xd0, 0xd3, 0xd7, 0x00, 0xff])]), s.data.subarray(at)]);
    } else s.data.fill(r.pick([0, 0xff]), r.int(s.data.length));
  },
  driInsert(p, r) {
    const v = r.pick([0, 1, 2, 7, 65535]);
    p.segs.splice(1 + r.int(p.segs.length), 0, { code: 0xdd, body: new Uint8Array([v >> 8, v & 255]), data: new Uint8Array(0) });
  },
  appInsert(p, r) {
    p.segs.splice(r.int(p.segs.length), 0, { code: 0xe0 + r.int(16), body: concat([new Uint8Array([0x1b, 0x5b, 0x32, 0x4a, 0]), r.bytes(r.int(300))]), data: new Uint8Array(0) });
  },
  dropEoi(p) {
    p.segs = p.segs.filter((x) => x.code !== 0xd9);
  },
};

// ------------------------------------------------------------------------------- TIFF
const TYPE_SIZE = [0, 1, 1, 2, 4, 8, 1, 1, 2, 4, 8, 4, 8, 4, 0, 0, 8, 8, 8];

function tiffInfo(b) {
  if (b.length < 8) return null;
  const le = b[0] === 0x49;
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  if (dv.getUint16(2, le) !== 42) return null;
  const ifd = dv.getUint32(4, le);
  if (ifd + 2 > b.length) return null;
  const n = dv.getUint16(ifd, le);
  const entries = [];
  for (let k = 0; k < n && ifd + 2 + 12 * (k + 1) <= b.length; k++) entries.push(ifd + 2 + 12 * k);
  return { le, dv, ifd, n, entries };
}

function entryValues(t, e) {
  const { dv, le } = t;
  const type = dv.getUint16(e + 2, le);
  const count = dv.getUint32(e + 4, le);
  const size = TYPE_SIZE[type] ?? 0;
  if (!size) return [];
  const at = size * count <= 4 ? e + 8 : dv.getUint32(e + 8, le);
  const locs = [];
  for (let i = 0; i < Math.min(count, 4096); i++) if (at + (i + 1) * size <= dv.byteLength) locs.push({ at: at + i * size, size });
  return locs;
}

function setVal(t, loc, v) {
  const { dv, le } = t;
  if (loc.size === 1) dv.setUint8(loc.at, v & 255);
  else if (loc.size === 2) dv.setUint16(loc.at, v & 0xffff, le);
  else dv.setUint32(loc.at, v >>> 0, le);
}

const TAG_VALUES = {
  256: [0, 1, 3, 65535, 100000, 0xffffffff],
  257: [0, 1, 2, 65535, 100000, 0xffffffff],
  258: [0, 1, 2, 4, 7, 8, 12, 16, 24, 32, 64, 255],
  259: [0, 1, 2, 3, 4, 5, 6, 7, 8, 32773, 32946, 34712, 50000, 65535],
  262: [0, 1, 2, 3, 4, 5, 6, 8, 9, 32844, 65535],
  266: [0, 1, 2, 3],
  273: [0, 1, 8, 0x7fffffff, 0xffffffff],
  277: [0, 1, 2, 3, 4, 5, 255, 65535],
  278: [0, 1, 2, 65535, 0xffffffff],
  279: [0, 1, 2, 0x7fffffff, 0xffffffff],
  284: [0, 1, 2, 3],
  317: [0, 1, 2, 3, 4],
  320: [0, 65535],
  322: [0, 1, 15, 16, 65535],
  323: [0, 1, 15, 16, 65535],
  324: [0, 1, 0xffffffff],
  325: [0, 1, 0xffffffff],
  338: [0, 1, 2, 3],
  339: [0, 1, 2, 3, 4, 5],
};

const TIFF = {
  tagValue(b, r) {
    const t = tiffInfo(b);
    if (!t || t.entries.length === 0) return GENERIC.bitflip(b, r);
    const cands = t.entries.filter((e) => t.dv.getUint16(e, t.le) in TAG_VALUES);
    const e = cands.length ? r.pick(cands) : r.pick(t.entries);
    const tag = t.dv.getUint16(e, t.le);
    const locs = entryValues(t, e);
    if (locs.length === 0) return b;
    const vals = TAG_VALUES[tag] ?? INTERESTING_32;
    if (r.chance(0.7)) setVal(t, r.pick(locs), r.pick(vals));
    else for (const l of locs) setVal(t, l, r.pick(vals));
    return b;
  },
  entryType(b, r) {
    const t = tiffInfo(b);
    if (!t || t.entries.length === 0) return GENERIC.bitflip(b, r);
    t.dv.setUint16(r.pick(t.entries) + 2, r.pick([0, 1, 2, 3, 4, 5, 7, 11, 12, 13, 14, 16, 17, 18, 255, 65535]), t.le);
    return b;
  },
  entryCount(b, r) {
    const t = tiffInfo(b);
    if (!t || t.entries.length === 0) return GENERIC.bitflip(b, r);
    const e = r.pick(t.entries);
    const c = t.dv.getUint32(e + 4, t.le);
    t.dv.setUint32(e + 4, r.pick([0, 1, 2, c + 1, c * 2, c - 1, 1 << 26, 0x7fffffff, 0xffffffff]) >>> 0, t.le);
    return b;
  },
  entryOffset(b, r) {
    const t = tiffInfo(b);
    if (!t || t.entries.length === 0) return GENERIC.bitflip(b, r);
    const e = r.pick(t.entries);
    t.dv.setUint32(e + 8, r.pick([0, 4, 8, t.ifd, b.length - 2, b.length, b.length + 100, 0xffffffff, r.int(b.length)]) >>> 0, t.le);
    return b;
  },
  entryTag(b, r) {
    const t = tiffInfo(b);
    if (!t || t.entries.length === 0) return GENERIC.bitflip(b, r);
    t.dv.setUint16(r.pick(t.entries), r.pick([...Object.keys(TAG_VALUES).map(Number), 0, 254, 330, 347, 530, 65535]), t.le);
    return b;
  },
  deleteEntry(b, r) {
    const t = tiffInfo(b);
    if (!t || t.entries.length < 2) return GENERIC.bitflip(b, r);
    const k = r.int(t.entries.length);
    const out = b.slice();
    const start = t.entries[k];
    out.copyWithin(start, start + 12, t.ifd + 2 + 12 * t.n + 4);
    new DataView(out.buffer).setUint16(t.ifd, t.n - 1, t.le);
    return out;
  },
  swapEntries(b, r) {
    const t = tiffInfo(b);
    if (!t || t.entries.length < 2) return GENERIC.bitflip(b, r);
    const i = r.pick(t.entries);
    const j = r.pick(t.entries);
    const tmp = b.slice(i, i + 12);
    b.copyWithin(i, j, j + 12);
    b.set(tmp, j);
    return b;
  },
  ifdCount(b, r) {
    const t = tiffInfo(b);
    if (!t) return GENERIC.bitflip(b, r);
    t.dv.setUint16(t.ifd, r.pick([0, 1, t.n + 1, t.n + 50, 0xffff]), t.le);
    return b;
  },
  nextIfd(b, r) {
    const t = tiffInfo(b);
    if (!t || t.ifd + 2 + 12 * t.n + 4 > b.length) return GENERIC.bitflip(b, r);
    t.dv.setUint32(t.ifd + 2 + 12 * t.n, r.pick([t.ifd, 8, 0xffffffff, b.length - 4, r.int(b.length)]) >>> 0, t.le);
    return b;
  },
  header(b, r) {
    const f = r.int(4);
    if (f === 0) b[0] = b[1] = b[0] === 0x49 ? 0x4d : 0x49; // byte order swapped
    else if (f === 1) {
      const le = b[0] === 0x49;
      b[le ? 2 : 3] = 43; // BigTIFF magic on a classic file
    } else if (f === 2) new DataView(b.buffer, b.byteOffset).setUint32(4, r.pick([0, 1, 7, b.length, 0xffffffff]) >>> 0, b[0] === 0x49);
    else b[r.int(8)] = r.int(256);
    return b;
  },
  stripData(b, r) {
    const t = tiffInfo(b);
    if (!t) return GENERIC.bitflip(b, r);
    const e = t.entries.find((x) => [273, 324].includes(t.dv.getUint16(x, t.le)));
    if (!e) return GENERIC.zeroBlock(b, r);
    const locs = entryValues(t, e);
    if (locs.length === 0) return b;
    const l = r.pick(locs);
    const off = l.size === 2 ? t.dv.getUint16(l.at, t.le) : t.dv.getUint32(l.at, t.le);
    if (off >= b.length) return b;
    const f = r.int(3);
    if (f === 0) for (let k = 0; k < 1 + r.int(16); k++) b[off + r.int(Math.min(4096, b.length - off))] ^= 1 << r.int(8);
    else if (f === 1) b.fill(r.pick([0, 0x80, 0xff]), off, off + 1 + r.int(256));
    else b.set(r.bytes(Math.min(64, b.length - off)), off);
    return b;
  },
};

// ------------------------------------------------------------------------------- driver
export function formatOf(b) {
  if (b.length >= 8 && b[0] === 0x89 && b[1] === 0x50) return 'png';
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8) return 'jpeg';
  if (b.length >= 4 && (b[0] === 0x49 || b[0] === 0x4d)) return 'tiff';
  return 'other';
}

function structural(format, b, r) {
  if (format === 'png') {
    const p = pngChunks(b);
    if (p.chunks.length === 0) return null;
    const name = r.pick(Object.keys(PNG));
    PNG[name](p, r);
    return { name: `png.${name}`, bytes: pngBuild(p.chunks, p.tail, r, r.chance(0.85)) };
  }
  if (format === 'jpeg') {
    const p = jpegSegments(b);
    if (p.segs.length === 0) return null;
    const name = r.pick(Object.keys(JPEG));
    JPEG[name](p, r);
    return { name: `jpeg.${name}`, bytes: jpegBuild(p) };
  }
  if (format === 'tiff') {
    const name = r.pick(Object.keys(TIFF));
    return { name: `tiff.${name}`, bytes: TIFF[name](b.slice(), r) };
  }
  return null;
}

/**
 * One damaged file from a seed: 1–3 stacked mutations, each structure-aware for the seed's format
 * (three times in four) or generic.
 * @returns {{bytes: Uint8Array, ops: string[]}}
 */
export function mutate(seed, r, other) {
  let b = seed.slice();
  const ops = [];
  const n = 1 + (r.chance(0.5) ? 0 : r.int(3));
  for (let k = 0; k < n; k++) {
    const s = r.chance(0.75) ? structural(formatOf(b), b, r) : null;
    if (s) {
      b = s.bytes;
      ops.push(s.name);
    } else {
      const name = r.pick(Object.keys(GENERIC));
      b = GENERIC[name](b.length ? b : seed.slice(), r, other);
      ops.push(`any.${name}`);
    }
    if (b.length === 0) break;
  }
  return { bytes: b, ops };
}
