// Child processes of the suite: the app, and load generators, each forked with tsx.
import { fork, type ChildProcess } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const script = (name: string) => fileURLToPath(new URL(`../${name}`, import.meta.url))

/** What the app's own process says of its memory, in MB; `collect` runs a full garbage collection first, so the heap is what is alive. */
export type AppMemory = { rss: number; heapUsed: number; heapTotal: number; external: number; arrayBuffers: number }
export type AppProcess = {
  port: number
  mqttPort: number
  pid: number
  stored: () => Promise<number>
  memory: (collect?: boolean) => Promise<AppMemory>
  stop: () => Promise<void>
}

/** The app as `npm start` runs it: compiled to one module, run with plain node. */
export async function startAppProcess(databaseUrl: string): Promise<AppProcess> {
  // @ts-expect-error a plain ES module of the project's scripts, without type declarations
  const { buildServer, serverNodeFlags } = await import('../../scripts/lib/build-server.mjs')
  const root = fileURLToPath(new URL('../..', import.meta.url))
  const module: string = await buildServer(root, 'bench/server-process.ts', '.build/bench-server.mjs')
  // As `npm start` runs it; BENCH_APP_NODE_ARGS adds flags such as `--heap-prof` or `--cpu-prof --cpu-prof-dir=…`.
  const extra = (process.env.BENCH_APP_NODE_ARGS ?? '').split(' ').filter(Boolean)
  const child = fork(module, [], { execArgv: [...serverNodeFlags(), ...extra], env: { ...process.env, DATABASE_URL: databaseUrl } })
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
        memory: (collect = false) => ask<AppMemory>(child, collect ? 'memory-collected' : 'memory'),
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

/** Runs a load generator to its end and answers its 'done' message; `onMessage` hears the others (such as 'connected'). */
export function runLoad<T>(name: string, job: import('node:child_process').Serializable, onMessage?: (m: { type: string }) => void): Promise<T> {
  return new Promise((resolve, reject) => {
    const child = fork(script(name), [], { execArgv: ['--import', 'tsx'] })
    child.on('message', (m: { type: string } & T) => (m.type === 'done' ? resolve(m) : onMessage?.(m)))
    child.once('error', reject)
    child.once('exit', (code) => code !== 0 && reject(new Error(`${name} exited with ${code}`)))
    child.send(job)
  })
}

const CLOCK_TICKS_PER_SECOND = 100

/** A process's resident memory (MB) and the CPU time it has used (seconds), from /proc; null once it has gone. */
function readProc(pid: number) {
  try {
    const kb = Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? 0)
    // Fields after the command name (which may hold spaces): utime and stime are the 12th and 13th.
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8')
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ')
    return { rssMb: kb / 1024, cpuSeconds: (Number(fields[11]) + Number(fields[12])) / CLOCK_TICKS_PER_SECOND }
  } catch {
    return null
  }
}

/**
 * Samples a process's resident memory from /proc every half second: the peak in MB (since the
 * start, or since the last `resetPeak`), the memory now, and its CPU use between two marks, as a
 * share of one core (100 % = one core busy all the time).
 */
export function sampleRss(pid: number) {
  let peak = 0
  const read = () => {
    const now = readProc(pid)
    if (now) peak = Math.max(peak, now.rssMb)
  }
  read()
  const timer = setInterval(read, 500)
  return {
    peakMb: () => peak,
    resetPeak: () => void ((peak = 0), read()),
    nowMb: () => readProc(pid)?.rssMb ?? NaN,
    cpuMark: () => ({ at: performance.now(), cpuSeconds: readProc(pid)?.cpuSeconds ?? NaN }),
    cpuShareSince: (mark: { at: number; cpuSeconds: number }) =>
      (100 * ((readProc(pid)?.cpuSeconds ?? NaN) - mark.cpuSeconds)) / ((performance.now() - mark.at) / 1000),
    cpuSecondsSince: (mark: { at: number; cpuSeconds: number }) => (readProc(pid)?.cpuSeconds ?? NaN) - mark.cpuSeconds,
    stop: () => clearInterval(timer),
  }
}
