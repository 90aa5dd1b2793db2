// Reads the MQTT fixed headers on a connection's byte stream and reports the first packet that
// declares itself larger than the limit. The broker drops such a connection as soon as the length is
// known, before the body is buffered: aedes (1.x) would otherwise hold the whole packet in memory,
// however large, and acknowledge it. Pure: fed the bytes the broker reads, in order.
//
// Fixed header (MQTT 3.1.1 §2.2): one byte of type and flags, then the remaining length as a
// variable byte integer of 1–4 bytes, 7 bits each, least significant first (§2.2.3).

export class PacketSizeGuard {
  /** Bytes of the current packet's body still to skip. */
  private skip = 0;
  /** Inside a fixed header: null before its first byte; otherwise the length read so far. */
  private header: { value: number; multiplier: number; bytes: number } | null = null;

  constructor(private readonly maxPacketBytes: number) {}

  /** Feeds the next bytes read from the connection; returns the size of an oversize (or malformed) packet, else null. */
  push(chunk: Uint8Array): number | null {
    let i = 0;
    while (i < chunk.length) {
      if (this.skip > 0) {
        const n = Math.min(this.skip, chunk.length - i);
        this.skip -= n;
        i += n;
        continue;
      }
      if (this.header === null) {
        this.header = { value: 0, multiplier: 1, bytes: 0 };
        i++; // the type-and-flags byte
        continue;
      }
      const b = chunk[i++];
      const h = this.header;
      h.value += (b & 0x7f) * h.multiplier;
      h.multiplier *= 128;
      h.bytes++;
      if (b & 0x80) {
        // A fifth length byte is malformed (§2.2.3): report it as too large.
        if (h.bytes === 4) return Number.POSITIVE_INFINITY;
        continue;
      }
      const size = 1 + h.bytes + h.value;
      if (size > this.maxPacketBytes) return size;
      this.skip = h.value;
      this.header = null;
    }
    return null;
  }
}
