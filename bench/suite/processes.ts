// Child processes of the suite: the app, and load generators, each forked with tsx.
import { fork, type ChildProcess } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const script = (name: string) => fileURLToPath(new URL(`../${name}`, import.meta.url))

export type AppProcess = { port: number; mqttPort: number; pid: number; stored: () => Promise<number>; stop: () => Promise<void> }

/** The app as `npm start` runs it: compiled to one module, run with plain node. */
export async function startAppProcess(databaseUrl: string): Promise<AppProcess> {
  // @ts-expect-error a plain ES module of the project's scripts, without type declarations
  const { buildServer } = await import('../../scripts/lib/build-server.mjs')
  const root = fileURLToPath(new URL('../..', import.meta.url))
  const module: string = await buildServer(root, 'bench/server-process.ts', '.build/bench-server.mjs')
  const child = fork(module, [], { execArgv: [], env: { ...process.env, DATABASE_URL: databaseUrl } })
  return new Promise((resolve, reject) => {
    child.once('error', reject)
    child.once('exit', (code) => reject(new Error(`the app exited (${code}) before it was ready`)))
    child.once('message', (m: { type: string; port: number; mqttPort: number }) => {
      if (m.type !== 'ready') return reject(new Error(`unexpected message ${m.type}`))
      child.removeAllListeners('exit')
      resolve({
        port: m.port,
        mqttPort: m.mqttPort,
        pid: child.pid!,
        stored: () => ask<{ stored: number }>(child, 'stats').then((s) => s.stored),
        stop: () =>
          new Promise<void>((done) => {
            child.once('exit', () => done())
            child.send({ type: 'stop' })
          }),
      })
    })
  })
}

function ask<T>(child: ChildProcess, type: string): Promise<T> {
  return new Promise((resolve) => {
    const on = (m: { type: string } & T) => {
      if (m.type !== type) return
      child.off('message', on)
      resolve(m)
    }
    child.on('message', on)
    child.send({ type })
  })
}

/** Runs a load generator to its end and answers its 'done' message. */
export function runLoad<T>(name: string, job: import('node:child_process').Serializable): Promise<T> {
  return new Promise((resolve, reject) => {
    const child = fork(script(name), [], { execArgv: ['--import', 'tsx'] })
    child.on('message', (m: { type: string } & T) => m.type === 'done' && resolve(m))
    child.once('error', reject)
    child.once('exit', (code) => code !== 0 && reject(new Error(`${name} exited with ${code}`)))
    child.send(job)
  })
}

/** Samples a process's resident memory from /proc every half second; answers the peak in MB. */
export function sampleRss(pid: number) {
  let peak = 0
  const read = () => {
    try {
      const kb = Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? 0)
      peak = Math.max(peak, kb / 1024)
    } catch {
      // the process has gone
    }
  }
  read()
  const timer = setInterval(read, 500)
  return { peakMb: () => peak, stop: () => clearInterval(timer) }
}
