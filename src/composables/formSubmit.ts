// Vuetify's form submit event resolves with the validation result; the v-model "valid" flag is not
// yet updated when the submit handler runs, so handlers wait for the event instead.
import type { SubmitEventPromise } from 'vuetify'

export async function formIsValid(event: SubmitEventPromise | Event | undefined): Promise<boolean> {
  if (event && 'then' in event && typeof event.then === 'function') return (await event).valid
  return true
}
