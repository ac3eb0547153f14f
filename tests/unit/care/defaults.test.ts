import { describe, expect, it } from 'vitest'
import { defaultCareTasksFor } from '@shared/care/defaults'

// Every interval below is `common practice` among keepers (no published standard): a weekly
// 10–15 % water change, a filter-sponge rinse every two weeks, carbon or chemical media
// replaced after 6–8 weeks, glass and a test-kit check weekly.
describe('default care tasks', () => {
  it('gives a tropical tank the five starter tasks with their intervals', () => {
    const tasks = defaultCareTasksFor({ kind: 'tropical_freshwater', stage: 'established' })
    expect(tasks.map((t) => [t.kind, t.recurrence])).toEqual([
      ['water_change', { kind: 'interval', everyDays: 7 }],
      ['filter_rinse', { kind: 'interval', everyDays: 14 }],
      ['media_replace', { kind: 'interval', everyDays: 42 }],
      ['glass_clean', { kind: 'interval', everyDays: 7 }],
      ['test_kit_check', { kind: 'interval', everyDays: 7 }],
    ])
  })

  it('defaults the water change to 12 %, inside the 10–15 % band', () => {
    const change = defaultCareTasksFor({ kind: 'planted', stage: 'cycling' })[0]
    expect(change?.defaultValues).toEqual({ percent: 12 })
    expect(change?.title).toBe('Partial water change')
  })

  it('names salt water for marine tanks and adds KH to their test-kit check', () => {
    const tasks = defaultCareTasksFor({ kind: 'marine', stage: 'established' })
    expect(tasks[0]?.title).toBe('Partial water change (pre-mixed salt water)')
    expect(tasks[4]?.title).toBe('Test-kit check: ammonia, nitrite, nitrate, pH, KH')
  })

  it('gives an empty tank no tasks', () => {
    expect(defaultCareTasksFor({ kind: 'coldwater', stage: 'empty' })).toEqual([])
  })
})
