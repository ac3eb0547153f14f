import { Duplex } from 'node:stream'
import type { Socket } from 'node:net'

const CONNECT = 1
const PUBLISH = 3

export type PacketLimits = {
  /** The first packet, CONNECT: client id, credentials and an optional will. */
  connectBytes: number
  /** A PUBLISH: topic, packet id and the message. */
  publishBytes: number
  /** Every other packet a device sends (SUBSCRIBE, PINGREQ, PUBACK, …). */
  otherBytes: number
}

export type PacketRefusal = { reason: string; packetType: number; declaredBytes: number; connected: boolean }

/**
 * Reads the fixed header of each MQTT packet as its bytes arrive (type, then the remaining
 * length), so a packet larger than its limit is refused before a byte of it is buffered. The
 * bytes themselves are not kept: only the count left to skip.
 */
export class PacketHeaderReader {
  private state: 'type' | 'length' | 'body' = 'type'
  private type = 0
  private length = 0
  private multiplier = 1
  private lengthBytes = 0
  private left = 0
  private packets = 0

  constructor(private readonly limits: PacketLimits) {}

  /** Reads one chunk; answers the refusal of the first packet over its limit, else null. */
  read(chunk: Buffer): PacketRefusal | null {
    let i = 0
    while (i < chunk.length) {
      if (this.state === 'body') {
        const step = Math.min(this.left, chunk.length - i)
        this.left -= step
        i += step
        if (this.left === 0) this.state = 'type'
        continue
      }
      const byte = chunk[i++]
      if (this.state === 'type') {
        this.type = byte >> 4
        if (this.packets === 0 && this.type !== CONNECT) return this.refuse('the first packet must be CONNECT', 0)
        this.state = 'length'
        this.length = 0
        this.multiplier = 1
        this.lengthBytes = 0
        continue
      }
      this.length += (byte & 0x7f) * this.multiplier
      this.multiplier *= 128
      this.lengthBytes++
      if (byte & 0x80) {
        if (this.lengthBytes === 4) return this.refuse('malformed remaining length', this.length)
        continue
      }
      const limit = this.packets === 0 ? this.limits.connectBytes : this.type === PUBLISH ? this.limits.publishBytes : this.limits.otherBytes
      if (this.length > limit) return this.refuse(`a ${this.length}-byte packet is over the ${limit}-byte limit`, this.length)
      this.packets++
      this.left = this.length
      this.state = this.left ? 'body' : 'type'
    }
    return null
  }

  private refuse(reason: string, declaredBytes: number): PacketRefusal {
    return { reason, packetType: this.type, declaredBytes, connected: this.packets > 0 }
  }
}

/**
 * The socket as the broker sees it: bytes pass through a `PacketHeaderReader`, and at the first
 * packet over its limit nothing more is passed on and `onRefused` decides what happens to the
 * connection. Writes go straight to the socket, with its backpressure.
 */
export class GuardedSocket extends Duplex {
  private refused = false

  constructor(
    readonly socket: Socket,
    limits: PacketLimits,
    private readonly onRefused: (refusal: PacketRefusal) => void,
  ) {
    super({ allowHalfOpen: false })
    const reader = new PacketHeaderReader(limits)
    socket.on('data', (chunk: Buffer) => {
      if (this.refused) return
      const refusal = reader.read(chunk)
      if (refusal) {
        this.refused = true
        socket.pause()
        return this.onRefused(refusal)
      }
      if (!this.push(chunk)) socket.pause()
    })
    socket.on('end', () => this.push(null))
    socket.on('error', (error) => this.destroy(error))
    socket.on('close', () => this.destroy())
  }

  /** Closes the connection at once, without waiting for anything to be sent. */
  cut() {
    this.socket.destroy()
    this.destroy()
  }

  _read() {
    if (!this.refused) this.socket.resume()
  }

  _write(chunk: Buffer, _encoding: BufferEncoding, callback: (error?: Error | null) => void) {
    // Handed to the socket at once, so what the broker wrote before it closes the connection is sent.
    if (this.socket.write(chunk)) return callback()
    const done = () => {
      this.socket.off('drain', done).off('close', done)
      callback()
    }
    this.socket.on('drain', done).on('close', done)
  }

  _final(callback: (error?: Error | null) => void) {
    this.socket.end(() => callback())
  }

  _destroy(error: Error | null, callback: (error?: Error | null) => void) {
    // Let the last packets (a CONNACK refusal, an outcome) reach the device, but never wait long on a peer that does not read.
    this.socket.end()
    setTimeout(() => this.socket.destroy(), 2000).unref()
    callback(error)
  }
}
