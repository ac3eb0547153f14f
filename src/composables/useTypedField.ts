import { ref, watch, type Ref } from 'vue'

export type TypedField = {
  /** The model in the product's words ("Tue 3 Mar 2026", "3:05 pm"). */
  format: (value: string) => string
  /** What was typed as a model value, or null when it cannot be read. */
  parse: (text: string) => string | null
  /** What to say under a text that cannot be read ("Type a day such as 3 Mar 2026"). */
  unreadable: () => string
  /** Why a value that was read is still refused (out of range), or null. */
  refuse?: (value: string) => string | null
}

/**
 * The text of a field that shows its model in the product's words and reads typing back when the
 * field is left or Enter is pressed. A text it cannot read stays as typed, with `problem` saying
 * what to type; an emptied field empties the model.
 */
export function useTypedField(model: Ref<string>, field: TypedField) {
  const text = ref('')
  const problem = ref<string | null>(null)

  watch(
    model,
    (value) => {
      text.value = field.format(value)
      problem.value = null
    },
    { immediate: true },
  )

  function commit() {
    if (!text.value.trim()) {
      model.value = ''
      return
    }
    const value = field.parse(text.value)
    problem.value = value === null ? field.unreadable() : (field.refuse?.(value) ?? null)
    if (value === null || problem.value) return
    model.value = value
    text.value = field.format(value)
  }

  return { text, problem, commit }
}
