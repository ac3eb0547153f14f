import { loadConfig } from '../../server/config'
import { startServer } from '../../server/server'

/**
 * One app instance as its own process, for the multi-instance suite: configured from the
 * environment like `npm start`, it tells the parent over IPC when it is ready, which readings it
 * stored itself (not those relayed from other instances) and when it takes the engine lock.
 */
async function main() {
  const running = await startServer(loadConfig())
  const send = (message: unknown) => process.send?.(message)
  running.ctx.events.on('readings.stored', (rows) => {
    if (!running.fanout.isRelaying()) send({ type: 'stored', times: rows.map((r) => r.time.getTime()) })
  })
  let leading = false
  setInterval(() => {
    if (running.rules.lock.isLeader !== leading) send({ type: 'leader', leading: (leading = running.rules.lock.isLeader) })
  }, 100).unref()
  send({ type: 'ready', port: running.port })
  process.on('SIGTERM', () => void running.stop().then(() => process.exit(0)))
  process.on('disconnect', () => void running.stop().then(() => process.exit(0)))
}

main().catch((error) => {
  console.error(error)
  process.exit(1)
})
