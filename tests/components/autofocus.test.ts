import { defineComponent, h, withDirectives } from 'vue'
import { mount } from '@vue/test-utils'
import { afterEach, describe, expect, it, vi } from 'vitest'
import { vAutofocus } from '@/directives/autofocus'

// Two fields, the first marked v-autofocus, as on the sign-in form.
const Form = defineComponent({
  render: () => h('form', [withDirectives(h('input', { id: 'email' }), [[vAutofocus]]), h('input', { id: 'password', type: 'password' })]),
})

afterEach(() => {
  vi.useRealTimers()
  document.body.innerHTML = ''
})

describe('v-autofocus', () => {
  it('focuses the field once the form is on screen', () => {
    vi.useFakeTimers()
    const wrapper = mount(Form, { attachTo: document.body })
    expect(document.activeElement?.id).not.toBe('email')
    vi.advanceTimersByTime(60)
    expect(document.activeElement?.id).toBe('email')
    wrapper.unmount()
  })

  it('leaves the focus in another field the person has already started typing in', () => {
    vi.useFakeTimers()
    const wrapper = mount(Form, { attachTo: document.body })
    const password = document.getElementById('password') as HTMLInputElement
    password.focus()
    vi.advanceTimersByTime(60)
    expect(document.activeElement).toBe(password)
    wrapper.unmount()
  })
})
