import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative, resolve } from 'node:path'
import { describe, expect, it } from 'vitest'

// The readings and their rollups are the largest tables and change shape the most (retention,
// rollups): every query on them lives in server/readings/, so a change there is a change in one
// folder. This walks the rest of the server for SQL that names them.
const root = resolve(__dirname, '../..')
const server = join(root, 'server')
const HOME = join(server, 'readings')
const MIGRATIONS = join(server, 'platform', 'db', 'migrations')

function filesUnder(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name)
    return statSync(path).isDirectory() ? filesUnder(path) : /\.(ts|mts|js|mjs)$/.test(name) ? [path] : []
  })
}

/** The readings tables, as the migrations create them: `readings` and every `readings_…` rollup. */
function readingsTables(): string[] {
  const names = new Set<string>()
  for (const file of filesUnder(MIGRATIONS)) {
    for (const match of readFileSync(file, 'utf8').matchAll(/CREATE TABLE\s+(?:IF NOT EXISTS\s+)?"?(readings\w*)"?/gi)) names.add(match[1].toLowerCase())
  }
  return [...names].sort()
}

const withoutComments = (source: string) => source.replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`\w])\/\/.*$/gm, '$1')

/** The tables a source text names in SQL: after a keyword for `readings`, anywhere for a rollup (its name is no English word). */
function tablesNamedIn(source: string, tables: string[]): string[] {
  const code = withoutComments(source)
  return tables.filter((table) =>
    table.includes('_')
      ? new RegExp(`\\b${table}\\b`).test(code)
      : new RegExp(`\\b(FROM|JOIN|INTO|UPDATE|TABLE|TRUNCATE)\\s+(ONLY\\s+)?"?${table}"?(?![\\w.])`, 'i').test(code),
  )
}

describe('readings tables are queried only in server/readings/', () => {
  const tables = readingsTables()

  it('finds the tables in the migrations', () => {
    expect(tables).toContain('readings')
    expect(tables).toContain('readings_hourly')
  })

  it('recognises SQL on them and leaves prose alone', () => {
    expect(tablesNamedIn('`SELECT time, value FROM readings WHERE tank_id = $1`', tables)).toEqual(['readings'])
    expect(tablesNamedIn('`DELETE FROM\n  readings r`', tables)).toEqual(['readings'])
    expect(tablesNamedIn("{ table: 'readings_hourly', hasId: false }", tables)).toEqual(['readings_hourly'])
    expect(tablesNamedIn('`insert into "readings" (tank_id) …`', tables)).toEqual(['readings'])
    expect(tablesNamedIn("// rebuilt FROM readings in readings_hourly\nconst x = 'readings from the bus'", tables)).toEqual([])
    expect(tablesNamedIn("events.emit('readings.stored', rows)", tables)).toEqual([])
  })

  it('no file outside server/readings/ and the migrations names them', () => {
    const offenders = filesUnder(server)
      .filter((file) => !file.startsWith(HOME + '/') && !file.startsWith(MIGRATIONS + '/'))
      .flatMap((file) => {
        const named = tablesNamedIn(readFileSync(file, 'utf8'), tables)
        return named.length ? [`${relative(root, file)} names ${named.join(', ')}: move the query into server/readings/`] : []
      })
    expect(offenders).toEqual([])
  })
})
