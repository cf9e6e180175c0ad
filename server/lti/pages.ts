// The few pages the platform's browser flow shows without the client app: a refusal (with a way forward when
// there is one), and the page that carries a signed answer back to the platform as an auto-submitted form.
const escape = (value: string) =>
  value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  )

const STYLE = `body{font-family:system-ui,sans-serif;margin:0;padding:2rem 1.25rem;color:#1b2430;background:#f6f7f9}
main{max-width:34rem;margin:0 auto;background:#fff;border:1px solid #d5dae1;border-radius:8px;padding:1.5rem}
h1{font-size:1.3rem;margin:0 0 .75rem}p{line-height:1.5}
a.button,button{display:inline-block;background:#1f5f8b;color:#fff;border:0;border-radius:6px;padding:.7rem 1.1rem;
font-size:1rem;text-decoration:none;cursor:pointer}`

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>${escape(title)} · Slipway</title><style>${STYLE}</style></head><body><main>${body}</main></body></html>`
}

export function refusalPage(message: string, options: { newWindowUrl?: string } = {}): string {
  const action = options.newWindowUrl
    ? `<p>Your browser keeps Slipway's sign-in check out of pages shown inside another site. Opening Slipway in
its own window starts the same activity there.</p>
<p><a class="button" href="${escape(options.newWindowUrl)}" target="_blank" rel="noopener">Open Slipway in a new window</a></p>`
    : `<p>Go back to your course and open the activity again. If it keeps happening, tell your instructor or the
platform's administrator what this page says.</p>`
  return page(
    'Could not open Slipway',
    `<h1>Slipway could not open this activity</h1><p>${escape(message)}</p>${action}`,
  )
}

/** A form posted to the platform as soon as the page loads (the script carries the response's CSP nonce). */
export function autoPostPage(action: string, fields: Record<string, string>, scriptNonce: string): string {
  const inputs = Object.entries(fields)
    .map(([name, value]) => `<input type="hidden" name="${escape(name)}" value="${escape(value)}">`)
    .join('')
  return page(
    'Returning to your course',
    `<h1>Returning to your course…</h1><form id="answer" method="post" action="${escape(action)}">${inputs}
<p>If nothing happens, <button type="submit">Continue to the course</button></p></form>
<script nonce="${escape(scriptNonce)}">document.getElementById('answer').submit()</script>`,
  )
}
