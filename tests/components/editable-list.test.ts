import { flushPromises, mount } from '@vue/test-utils'
import { describe, expect, it, vi } from 'vitest'
import { defineComponent, h, nextTick, reactive, ref } from 'vue'
import { ApiError } from '@/api/errors'
import { useEditableList } from '@/composables/useEditableList'
import { useFieldErrors, type FieldErrors } from '@/composables/useFieldErrors'

interface Row {
  id: number
  name: string
}

/** Runs the composable inside a component, so its watchers live and die with one. */
function withList(options: Parameters<typeof useEditableList<Row>>[0]) {
  let list!: ReturnType<typeof useEditableList<Row>>
  const wrapper = mount(defineComponent({ setup: () => ((list = useEditableList<Row>(options)), () => h('div')) }))
  return { list, wrapper }
}

const badName = () => new ApiError({ status: 400, code: 'invalid_input', message: 'name: taken', fields: { name: 'already used on this site' } })

describe('useEditableList', () => {
  it('loads at once and again when its source changes, and keeps the answer for the current source', async () => {
    const tankId = ref(1)
    const answers: Record<number, (rows: Row[]) => void> = {}
    const load = vi.fn(() => new Promise<Row[]>((resolve) => (answers[tankId.value] = resolve)))
    const { list } = withList({ load, source: () => tankId.value })
    expect(load).toHaveBeenCalledTimes(1)
    expect(list.loading.value).toBe(true)
    tankId.value = 2
    await nextTick()
    expect(load).toHaveBeenCalledTimes(2)
    answers[2]!([{ id: 20, name: 'second tank' }])
    await flushPromises()
    answers[1]!([{ id: 10, name: 'first tank' }])
    await flushPromises()
    expect(list.items.value).toEqual([{ id: 20, name: 'second tank' }])
    expect(list.loading.value).toBe(false)
    expect(list.loaded.value).toBe(true)
  })

  it('reports a failed load and loads again on retry', async () => {
    const load = vi
      .fn<() => Promise<Row[]>>()
      .mockRejectedValueOnce(new ApiError({ status: 503, code: 'unavailable', message: 'The database is not answering.' }))
    load.mockResolvedValueOnce([{ id: 1, name: 'Reef' }])
    const { list } = withList({ load, source: () => 0 })
    await flushPromises()
    expect(list.failure.value).toBe('The database is not answering.')
    expect(list.loaded.value).toBe(false)
    await list.load()
    expect(list.failure.value).toBeNull()
    expect(list.items.value).toEqual([{ id: 1, name: 'Reef' }])
  })

  it('closes the dialog, refreshes the list and tells the caller after a save', async () => {
    const rows: Row[] = [{ id: 1, name: 'Reef' }]
    const onChanged = vi.fn()
    const { list } = withList({ load: async () => [...rows], source: () => 0, onChanged })
    await flushPromises()
    list.openDialog({ id: 1, name: 'Reef' })
    expect(list.dialogOpen.value).toBe(true)
    const saved = list.save(async (editing) => {
      expect(list.saving.value).toBe(true)
      rows[0] = { id: editing!.id, name: 'Reef display' }
      return rows[0]
    })
    expect(await saved).toEqual({ id: 1, name: 'Reef display' })
    expect(list.dialogOpen.value).toBe(false)
    expect(list.saving.value).toBe(false)
    expect(list.items.value).toEqual([{ id: 1, name: 'Reef display' }])
    expect(onChanged).toHaveBeenCalledTimes(1)
  })

  it('keeps the dialog open with the fields of a 400, cleared when the dialog opens again', async () => {
    const load = vi.fn(async () => [] as Row[])
    const { list } = withList({ load, source: () => 0 })
    await flushPromises()
    list.openDialog()
    expect(await list.save(() => Promise.reject(badName()))).toBeUndefined()
    expect(list.dialogOpen.value).toBe(true)
    expect(list.fieldErrors.value).toEqual({ name: 'already used on this site' })
    expect(list.failure.value).toBeNull()
    expect(load).toHaveBeenCalledTimes(1)
    list.openDialog()
    expect(list.fieldErrors.value).toEqual({})
  })

  it('maps the server’s field paths when asked', async () => {
    const { list } = withList({ load: async () => [], mapFields: (fields) => ({ title: fields.name! }) })
    list.openDialog()
    await list.save(() => Promise.reject(badName()))
    expect(list.fieldErrors.value).toEqual({ title: 'already used on this site' })
  })

  it('closes the dialog and shows any other failure above the list', async () => {
    const { list } = withList({ load: async () => [] })
    list.openDialog()
    await list.save(() => Promise.reject(new ApiError({ status: 409, code: 'conflict', message: 'Someone changed this first.' })))
    expect(list.dialogOpen.value).toBe(false)
    expect(list.failure.value).toBe('Someone changed this first.')
    expect(list.fieldErrors.value).toEqual({})
  })

  it('marks the row busy during an action, refreshes after it and reports its failure', async () => {
    const rows: Row[] = [
      { id: 1, name: 'Reef' },
      { id: 2, name: 'Quarantine' },
    ]
    const { list } = withList({ load: async () => [...rows], source: () => 0 })
    await flushPromises()
    const removing = list.act(2, async () => {
      expect(list.busyId.value).toBe(2)
      rows.pop()
    })
    await removing
    expect(list.busyId.value).toBeNull()
    expect(list.items.value.map((r) => r.id)).toEqual([1])
    await list.act(1, () => Promise.reject(new ApiError({ status: 403, code: 'forbidden', message: 'Only an owner may do that.' })))
    expect(list.failure.value).toBe('Only an owner may do that.')
    expect(list.items.value.map((r) => r.id)).toEqual([1])
  })
})

describe('useFieldErrors', () => {
  function withForm(server: () => FieldErrors) {
    const draft = reactive({ name: '', heater: { topCm: 10, watts: 100 } })
    let form!: ReturnType<typeof useFieldErrors>
    mount(defineComponent({ setup: () => ((form = useFieldErrors(() => ({ ...draft }), server)), () => h('div')) }))
    return { draft, form }
  }

  it('shows the server’s messages and drops a field’s message as soon as that field changes', async () => {
    const server = ref<FieldErrors>({})
    const { draft, form } = withForm(() => server.value)
    server.value = { name: 'already used on this site', 'heater.topCm': 'above the water line', _form: 'check the heater' }
    await nextTick()
    expect(form.errors.value).toEqual({ name: 'already used on this site', 'heater.topCm': 'above the water line', _form: 'check the heater' })
    draft.name = 'Reef 2'
    await nextTick()
    expect(form.errors.value).toEqual({ 'heater.topCm': 'above the water line' })
    draft.heater.topCm = 8
    await nextTick()
    expect(form.errors.value).toEqual({})
  })

  it('keeps the messages of fields that did not change, and its own checks follow the same rule', async () => {
    const { draft, form } = withForm(() => ({}))
    form.show({ name: 'required', 'heater.watts': 'enter a number' })
    draft.heater.topCm = 12
    await nextTick()
    expect(form.errors.value).toEqual({ name: 'required' })
    draft.name = 'Reef'
    await nextTick()
    expect(form.errors.value).toEqual({})
  })
})
