import type { Directive } from 'vue'

const FIELD = 'input,textarea,select'
const observers = new WeakMap<HTMLElement, IntersectionObserver>()
const timers = new WeakMap<HTMLElement, ReturnType<typeof setTimeout>>()

function focusUnlessTyping(el: HTMLElement) {
  // Someone already typing in another field (a quick hand, a password manager) keeps their place:
  // a late focus would send the rest of their typing into this field.
  if (document.activeElement?.matches(FIELD)) return
  ;(el.matches(FIELD) ? el : el.querySelector<HTMLElement>(FIELD))?.focus()
}

/**
 * `v-autofocus` on a field: focus it once it is on screen (after a dialog's opening transition),
 * unless the person has already started in another field.
 */
export const vAutofocus: Directive<HTMLElement> = {
  mounted(el) {
    if (typeof IntersectionObserver === 'undefined') {
      timers.set(
        el,
        setTimeout(() => focusUnlessTyping(el), 50),
      )
      return
    }
    const observer = new IntersectionObserver((entries) => {
      if (!entries.some((e) => e.isIntersecting)) return
      observer.disconnect()
      observers.delete(el)
      // Past the overlay's enter setup, which keeps a dialog's content hidden for a moment.
      timers.set(
        el,
        setTimeout(() => focusUnlessTyping(el), 50),
      )
    })
    observer.observe(el)
    observers.set(el, observer)
  },
  unmounted(el) {
    // A field gone before its focus is due must not be focused afterwards.
    clearTimeout(timers.get(el))
    timers.delete(el)
    observers.get(el)?.disconnect()
    observers.delete(el)
  },
}
