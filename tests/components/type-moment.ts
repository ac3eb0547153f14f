import { DOMWrapper, flushPromises } from '@vue/test-utils'

/**
 * Types a `YYYY-MM-DDTHH:MM` moment into a DateTimeField named `name` as a person would: the day
 * into its day part and the time into its time part (`<name>Time`), leaving each in turn.
 */
export async function typeMoment(name: string, value: string) {
  for (const [selector, text] of [
    [`input[name="${name}"]`, value.slice(0, 10)],
    [`input[name="${name}Time"]`, value.slice(11, 16)],
  ] as const) {
    const input = new DOMWrapper(document.querySelector(selector)!)
    await input.setValue(text)
    await input.trigger('blur')
  }
  await flushPromises()
}
