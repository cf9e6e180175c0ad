// Files into one zip (jszip), for the cohort's training records. PDFs are already compressed: stored as is.
import JSZip from 'jszip'

export async function zipFiles(files: { name: string; bytes: Buffer }[]): Promise<Buffer> {
  const zip = new JSZip()
  const used = new Map<string, number>()
  for (const file of files) {
    // Two apprentices with the same name get "name.pdf" and "name-2.pdf".
    const n = (used.get(file.name) ?? 0) + 1
    used.set(file.name, n)
    zip.file(n === 1 ? file.name : file.name.replace(/(\.[a-z]+)$/, `-${n}$1`), file.bytes, {
      binary: true,
      date: new Date(),
    })
  }
  return zip.generateAsync({ type: 'nodebuffer', compression: 'STORE' })
}
