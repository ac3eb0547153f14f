import { describe, expect, it } from 'vitest'
import { PacketHeaderReader } from '../../server/mqtt/packet-guard'

const limits = { connectBytes: 100, publishBytes: 1000, otherBytes: 50 }
const connect = Buffer.concat([Buffer.from([0x10, 10]), Buffer.alloc(10)])

describe('MQTT fixed-header reader', () => {
  it('passes packets within their limits, whatever the chunking', () => {
    // PUBLISH of 300 bytes: remaining length 300 = 0xac 0x02 (MQTT 3.1.1, 2.2.3).
    const bytes = Buffer.concat([connect, Buffer.from([0x32, 0xac, 0x02]), Buffer.alloc(300), Buffer.from([0xc0, 0])])
    for (const size of [1, 2, 7, bytes.length]) {
      const reader = new PacketHeaderReader(limits)
      for (let i = 0; i < bytes.length; i += size) expect(reader.read(bytes.subarray(i, i + size))).toBeNull()
    }
  })

  it('refuses a first packet that is not CONNECT at its first byte', () => {
    expect(new PacketHeaderReader(limits).read(Buffer.from([0x30]))).toMatchObject({ packetType: 3, connected: false })
  })

  it('refuses a packet over its limit as soon as its length is read', () => {
    const reader = new PacketHeaderReader(limits)
    expect(reader.read(connect)).toBeNull()
    expect(reader.read(Buffer.from([0x30, 0xe9]))).toBeNull() // length continues
    expect(reader.read(Buffer.from([0x07]))).toMatchObject({ packetType: 3, declaredBytes: 1001, connected: true })
  })

  it('holds other packets and CONNECT to their own limits', () => {
    expect(new PacketHeaderReader(limits).read(Buffer.from([0x10, 101]))).toMatchObject({ declaredBytes: 101, connected: false })
    const reader = new PacketHeaderReader(limits)
    expect(reader.read(Buffer.concat([connect, Buffer.from([0x82, 51])]))).toMatchObject({ packetType: 8, declaredBytes: 51 })
  })

  it('refuses a remaining length longer than four bytes', () => {
    const reader = new PacketHeaderReader({ ...limits, publishBytes: Number.MAX_SAFE_INTEGER })
    expect(reader.read(Buffer.concat([connect, Buffer.from([0x30, 0xff, 0xff, 0xff, 0xff])]))).toMatchObject({ reason: 'malformed remaining length' })
  })
})
