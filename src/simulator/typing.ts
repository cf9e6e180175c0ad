// Panel keys (letters, Delete, + − 0, Escape) act only when the user is not typing in a field or menu.
export function typingInField(e: KeyboardEvent): boolean {
  const el = e.target as HTMLElement | null
  return !!el?.closest?.('input, textarea, select, [contenteditable], .v-overlay__content')
}
