import { createServer as createTcpServer } from 'node:net'
import type { Server } from 'node:http'

/** A TCP port of 127.0.0.1 nothing listens on now, for a process that must be told its port before it starts. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createTcpServer()
    server.once('error', reject)
    server.listen(0, '127.0.0.1', () => {
      const address = server.address()
      const port = typeof address === 'object' && address ? address.port : 0
      server.close(() => resolve(port))
    })
  })
}

/** Starts `server` on a port of 127.0.0.1 the system picks and answers its origin, `http://127.0.0.1:<port>`. */
export async function listenOnFreePort(server: Server): Promise<string> {
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(0, '127.0.0.1', () => resolve())
  })
  const address = server.address()
  return `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}`
}
