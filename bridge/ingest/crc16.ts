/**
 * CRC-16/CCITT-FALSE, the checksum of every line of the acquisition line protocol
 * (docs/line-protocol.md).
 *
 * Definition (Greg Cook, "Catalogue of parametrised CRC algorithms", reveng CRC catalogue,
 * entry CRC-16/IBM-3740, alias CRC-16/CCITT-FALSE; parameters quoted from memory):
 *   width=16 poly=0x1021 init=0xffff refin=false refout=false xorout=0x0000 check=0x29b1
 * "check" is the CRC of the nine ASCII bytes "123456789"; test/ingest/line-protocol.test.ts
 * verifies it. Chosen because it is tiny to implement in a microcontroller (no reflection) and
 * detects every burst error up to 16 bits, which a single flipped byte on a noisy line is.
 */

const POLY = 0x1021;
const INIT = 0xffff;

/** 256-entry table for the MSB-first (non-reflected) algorithm, one byte per step. */
const TABLE: Uint16Array = (() => {
  const t = new Uint16Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n << 8;
    for (let k = 0; k < 8; k++) c = c & 0x8000 ? ((c << 1) ^ POLY) & 0xffff : (c << 1) & 0xffff;
    t[n] = c;
  }
  return t;
})();

/** CRC-16/CCITT-FALSE of the bytes of `data` (a string is taken as Latin-1 / ASCII bytes). */
export function crc16CcittFalse(data: string | Uint8Array): number {
  let crc = INIT;
  if (typeof data === 'string') {
    for (let i = 0; i < data.length; i++) {
      crc = ((crc << 8) & 0xffff) ^ TABLE[((crc >> 8) ^ data.charCodeAt(i)) & 0xff];
    }
  } else {
    for (let i = 0; i < data.length; i++) crc = ((crc << 8) & 0xffff) ^ TABLE[((crc >> 8) ^ data[i]) & 0xff];
  }
  return crc;
}

/** Bit-at-a-time version straight from the catalogue parameters, used by the tests as a cross-check. */
export function crc16CcittFalseBitwise(data: Uint8Array): number {
  let crc = INIT;
  for (const byte of data) {
    crc ^= byte << 8;
    for (let k = 0; k < 8; k++) crc = crc & 0x8000 ? ((crc << 1) ^ POLY) & 0xffff : (crc << 1) & 0xffff;
  }
  return crc;
}

/** Four upper-case hex digits, as written on the line. */
export function crcHex(crc: number): string {
  return crc.toString(16).toUpperCase().padStart(4, '0');
}
