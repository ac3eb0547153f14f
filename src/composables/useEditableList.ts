import { ref, shallowRef, watch, type Ref, type ShallowRef, type WatchSource } from 'vue'
import { ApiError, describeError } from '@/api/errors'
import type { FieldErrors } from './useFieldErrors'

export interface EditableListOptions<T> {
  /** Fetches the whole list. */
  load: () => Promise<T[]>
  /** Loads at once and again whenever this changes (a tank id, a site id). */
  source?: WatchSource
  /** Runs after every successful save or row action, once the list has been refreshed. */
  onChanged?: () => void
  /** Maps the server's field paths onto the dialog's field names (the error tells a conflict's code). */
  mapFields?: (fields: Record<string, string>, error: ApiError) => FieldErrors
  /** Puts a failure into words for above the list, where the screen knows better than the server's message. */
  describe?: (error: unknown) => string
}

export interface SaveOptions<R> {
  /** `false` when the caller puts the result into the list itself rather than fetching it again. */
  refresh?: boolean
  /** Runs with the saved result after the dialog has closed. */
  onSaved?: (result: R) => void | Promise<void>
  /** The dialog stays open after success, to show what the save answered (an invitation's link). */
  keepOpen?: boolean
}

/**
 * A list loaded from the API with a create/edit dialog and per-row actions: loading and busy
 * state, a load error with retry, the server's 400 field errors for the dialog, and the list
 * refreshed and the dialog closed after a successful save. `E` is what the dialog is editing.
 */
export function useEditableList<T, E = T>(options: EditableListOptions<T>) {
  const items = shallowRef<T[]>([]) as ShallowRef<T[]>
  const loading = ref(false)
  const loaded = ref(false)
  const failure = ref<string | null>(null)
  const dialogOpen = ref(false)
  const editing = ref(null) as Ref<E | null>
  const saving = ref(false)
  const fieldErrors = ref<FieldErrors>({})
  const busyId = ref<number | string | null>(null)
  const describe = options.describe ?? describeError

  let latest = 0
  async function load() {
    const call = ++latest
    loading.value = true
    failure.value = null
    try {
      const list = await options.load()
      // A slower answer for an earlier tank or site must not replace the current one.
      if (call !== latest) return
      items.value = list
      loaded.value = true
    } catch (error) {
      if (call === latest) failure.value = describe(error)
    } finally {
      if (call === latest) loading.value = false
    }
  }
  if (options.source) watch(options.source, () => void load(), { immediate: true })

  function openDialog(next: E | null = null) {
    editing.value = next
    fieldErrors.value = {}
    dialogOpen.value = true
  }

  /**
   * Sends what the dialog holds. A 400 naming fields keeps the dialog open with those fields'
   * messages; any other failure closes it and shows the message above the list.
   */
  async function save<R>(write: (editing: E | null) => Promise<R>, saveOptions: SaveOptions<R> = {}): Promise<R | undefined> {
    saving.value = true
    fieldErrors.value = {}
    try {
      const result = await write(editing.value)
      if (!saveOptions.keepOpen) dialogOpen.value = false
      if (saveOptions.refresh !== false) await load()
      await saveOptions.onSaved?.(result)
      options.onChanged?.()
      return result
    } catch (error) {
      if (error instanceof ApiError && Object.keys(error.fields).length) {
        fieldErrors.value = options.mapFields ? options.mapFields(error.fields, error) : { ...error.fields }
      } else {
        failure.value = describe(error)
        dialogOpen.value = false
      }
      return undefined
    } finally {
      saving.value = false
    }
  }

  /** A one-click action on one row (delete, archive, revoke); that row's buttons show it busy. */
  async function act<R>(id: number | string, action: () => Promise<R>, actOptions: { refresh?: boolean } = {}): Promise<R | undefined> {
    busyId.value = id
    failure.value = null
    try {
      const result = await action()
      if (actOptions.refresh !== false) await load()
      options.onChanged?.()
      return result
    } catch (error) {
      failure.value = describe(error)
      return undefined
    } finally {
      busyId.value = null
    }
  }

  return { items, loading, loaded, failure, load, dialogOpen, editing, saving, fieldErrors, openDialog, save, act, busyId }
}
