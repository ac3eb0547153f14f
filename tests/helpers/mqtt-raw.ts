import { connect as tcpConnect, type Socket } from 'node:net'

/** A variable byte integer, as MQTT writes a packet's remaining length (MQTT 3.1.1, 2.2.3). */
export function remainingLength(n: number) {
  const bytes: number[] = []
  do {
    let byte = n % 128
    n = Math.floor(n / 128)
    if (n > 0) byte |= 0x80
    bytes.push(byte)
  } while (n > 0)
  return Buffer.from(bytes)
}

/** A length-prefixed string field. */
export const field = (b: Buffer | string) => {
  const bytes = Buffer.from(b)
  return Buffer.concat([Buffer.from([bytes.length >> 8, bytes.length & 0xff]), bytes])
}

/** CONNECT, MQTT 3.1.1, with user name and password, clean session, keepalive 60 s. */
export function connectPacket(username: string, password: string, clientId: string) {
  const variable = Buffer.concat([field('MQTT'), Buffer.from([4, 0xc2, 0, 60]), field(clientId), field(username), field(password)])
  return Buffer.concat([Buffer.from([0x10]), remainingLength(variable.length), variable])
}

/** The start of a QoS 0 PUBLISH announcing `payloadBytes` of message after the topic. */
export function publishHeader(topic: string, payloadBytes: number) {
  const name = field(topic)
  return Buffer.concat([Buffer.from([0x30]), remainingLength(name.length + payloadBytes), name])
}

export type RawSocket = { socket: Socket; closedAt: Promise<number>; written: () => number }

/** A plain TCP socket to a broker that counts what it wrote and when it was closed. */
export async function rawSocket(port: number): Promise<RawSocket> {
  const socket = tcpConnect(port, '127.0.0.1')
  socket.on('error', () => {})
  await new Promise((resolve, reject) => socket.once('connect', resolve).once('error', reject))
  let written = 0
  const write = socket.write.bind(socket)
  socket.write = ((chunk: Buffer, ...rest: never[]) => {
    written += chunk.length
    return write(chunk, ...rest)
  }) as typeof socket.write
  return { socket, closedAt: new Promise((resolve) => socket.once('close', () => resolve(Date.now()))), written: () => written }
}

/** Streams zero bytes until the other end closes the socket or `total` bytes are written. */
export async function streamZeros(raw: RawSocket, total: number) {
  const chunk = Buffer.alloc(64 * 1024)
  while (raw.written() < total && !raw.socket.destroyed) {
    if (!raw.socket.write(chunk)) await Promise.race([new Promise((r) => raw.socket.once('drain', r)), raw.closedAt])
  }
}
