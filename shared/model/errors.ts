/** Thrown for a call the model cannot honour (time going back, a non-integer step, a bad setup). */
export class ModelInputError extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'ModelInputError'
  }
}
