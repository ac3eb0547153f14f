// The app in a process of its own, so the suite measures the app's memory and CPU and nothing else.
// Reports { type: 'ready', port, mqttPort } over IPC, answers { type: 'stats' } with the rows it
// has stored, { type: 'memory' } with its memory (after a full collection for 'memory-collected'), and stops on { type: 'stop' }.
import { setFlagsFromString } from 'node:v8'
import { runInNewContext } from 'node:vm'
import { testConfig } from '../server/config'
import { startServer } from '../server/server'

const running = await startServer(
  testConfig({
    databaseUrl: process.env.DATABASE_URL!,
    serveClient: true,
    signInLimit: 100_000,
    mqtt: { host: '127.0.0.1', port: 0 },
    logLevel: 'silent',
    // CLUSTER_FANOUT=false measures one instance alone, as a single box runs it (README, Configuration).
    clusterFanout: process.env.CLUSTER_FANOUT !== 'false',
    mail: { fakeSmtpPort: 0, from: 'bench@tankwarden.invalid' },
  }),
)
let stored = 0
running.ctx.events.on('readings.stored', (rows) => void (stored += rows.length))
process.send!({ type: 'ready', port: running.port, mqttPort: running.mqttPort })
// A full collection on request, so the suite can read what is alive (the app itself runs without --expose-gc).
setFlagsFromString('--expose-gc')
const collect = runInNewContext('gc') as () => void
const mb = (bytes: number) => bytes / 2 ** 20
process.on('message', async (m: { type: string }) => {
  if (m.type === 'stats') process.send!({ type: 'stats', stored })
  if (m.type === 'memory' || m.type === 'memory-collected') {
    if (m.type === 'memory-collected') collect()
    const u = process.memoryUsage()
    process.send!({
      type: m.type,
      rss: mb(u.rss),
      heapUsed: mb(u.heapUsed),
      heapTotal: mb(u.heapTotal),
      external: mb(u.external),
      arrayBuffers: mb(u.arrayBuffers),
    })
  }
  if (m.type !== 'stop') return
  await running.stop()
  process.exit(0)
})
