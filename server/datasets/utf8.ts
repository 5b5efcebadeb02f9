import "server-only";

/**
 * How many bytes at the end of `bytes` start a UTF-8 sequence that continues in the next chunk
 * (0 to 3). Those bytes are held back so a chunk boundary never splits a character.
 */
export function incompleteTail(bytes: Uint8Array): number {
  const n = bytes.length;
  const lookBack = Math.min(3, n);
  for (let k = 1; k <= lookBack; k++) {
    const b = bytes[n - k];
    if ((b & 0xc0) === 0x80) continue; // continuation byte: keep looking for the lead byte
    const need = b >= 0xf0 ? 4 : b >= 0xe0 ? 3 : b >= 0xc0 ? 2 : 1;
    return need > k ? k : 0;
  }
  return 0;
}

/**
 * Offsets of the invalid byte sequences in `bytes` (a run of whole characters), at most `max`, by
 * the rules of the WHATWG UTF-8 decoder (the one `TextDecoder` uses): overlong forms, surrogates and
 * code points above U+10FFFF are invalid. Each maximal invalid subpart counts once.
 */
export function findInvalidUtf8(bytes: Uint8Array, max = Infinity): number[] {
  const bad: number[] = [];
  const n = bytes.length;
  let i = 0;
  while (i < n && bad.length < max) {
    const b = bytes[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    let need = 0;
    let lo = 0x80;
    let hi = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) need = 1;
    else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      if (b === 0xe0) lo = 0xa0;
      if (b === 0xed) hi = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      if (b === 0xf0) lo = 0x90;
      if (b === 0xf4) hi = 0x8f;
    } else {
      bad.push(i);
      i++;
      continue;
    }
    let j = 1;
    for (; j <= need; j++) {
      const c = i + j < n ? bytes[i + j] : -1;
      const low = j === 1 ? lo : 0x80;
      const high = j === 1 ? hi : 0xbf;
      if (c < low || c > high) break;
    }
    if (j <= need) {
      bad.push(i);
      i += j; // skip the valid prefix of the broken sequence
    } else {
      i += need + 1;
    }
  }
  return bad;
}
