// The broker's packet-size guard against packets made by mqtt-packet (the encoder mqtt.js uses).
import { describe, expect, it } from 'vitest';
import mqttPacket from 'mqtt-packet';
import { PacketSizeGuard } from '../../../src/lib/telemetry/packet-size';
import { limits, topicFor } from '../../../src/lib/telemetry/wire';

const publish = (payloadBytes: number, messageId = 1) =>
  mqttPacket.generate({
    cmd: 'publish',
    topic: topicFor('HL-TEST-0001', 'telemetry'),
    payload: Buffer.alloc(payloadBytes, 0x20),
    qos: 1,
    messageId,
    retain: false,
    dup: false,
  });
const connect = mqttPacket.generate({
  cmd: 'connect',
  protocolId: 'MQTT',
  protocolVersion: 4,
  clientId: 'HL-TEST-0001',
  clean: false,
  keepalive: 60,
  username: 'HL-TEST-0001',
  password: Buffer.from('hldt_x'),
});

/** Feeds `bytes` in chunks of `size`; the first non-null answer, and how many bytes it took. */
function feed(guard: PacketSizeGuard, bytes: Buffer, size: number): { result: number | null; at: number } {
  for (let i = 0; i < bytes.length; i += size) {
    const result = guard.push(bytes.subarray(i, i + size));
    if (result !== null) return { result, at: i + size };
  }
  return { result: null, at: bytes.length };
}

describe('PacketSizeGuard', () => {
  it('lets a session of ordinary packets through, whatever the chunking', () => {
    const stream = Buffer.concat([
      connect,
      publish(200, 1),
      mqttPacket.generate({ cmd: 'pingreq' }),
      publish(limits.maxPayloadBytes, 2),
      publish(0, 3),
    ]);
    for (const size of [1, 3, 7, 1500, 65_536, stream.length])
      expect(feed(new PacketSizeGuard(limits.maxPacketBytes), stream, size).result).toBeNull();
  });

  it("takes a publish of the contract's full payload (1 MiB) and reports one byte over the packet limit", () => {
    // A 1 MiB payload plus its topic, packet id and fixed header stays inside the packet limit.
    expect(publish(limits.maxPayloadBytes).length).toBeLessThanOrEqual(limits.maxPacketBytes);
    const exact = publish(limits.maxPayloadBytes);
    const over = publish(limits.maxPayloadBytes + (limits.maxPacketBytes - exact.length) + 1);
    expect(over.length).toBe(limits.maxPacketBytes + 1);
    expect(feed(new PacketSizeGuard(limits.maxPacketBytes), over, 1).result).toBe(limits.maxPacketBytes + 1);
  });

  it('reports an oversize packet from its header, before its body arrives', () => {
    const big = publish(4 * 1024 * 1024);
    const guard = new PacketSizeGuard(limits.maxPacketBytes);
    expect(guard.push(connect)).toBeNull();
    // Fixed header: 1 type byte and a 4-byte remaining length for a body over 2 MiB (MQTT 3.1.1 §2.2.3).
    const { result, at } = feed(guard, big, 1);
    expect(result).toBe(big.length);
    expect(at).toBe(5);
  });

  it('reports a remaining length longer than four bytes as malformed', () => {
    expect(new PacketSizeGuard(limits.maxPacketBytes).push(Buffer.from([0x30, 0xff, 0xff, 0xff, 0xff, 0x01]))).toBe(
      Number.POSITIVE_INFINITY,
    );
  });
});
