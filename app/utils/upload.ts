/**
 * A multipart upload with progress, through XMLHttpRequest (fetch cannot report upload
 * progress). Resolves with the parsed JSON answer on 2xx, or with the server's message.
 */
export function uploadWithProgress<T>(
  url: string,
  form: FormData,
  onProgress: (fraction: number) => void,
): Promise<{ ok: true; body: T } | { ok: false; message: string }> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest()
    xhr.open('POST', url)
    xhr.setRequestHeader('accept', 'application/json')
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total)
    }
    xhr.onload = () => {
      let body: { statusMessage?: string; message?: string } = {}
      try {
        body = JSON.parse(xhr.responseText)
      } catch {
        // a non-JSON answer (a proxy's 413 page): reported by status below
      }
      if (xhr.status >= 200 && xhr.status < 300) resolve({ ok: true, body: body as T })
      else resolve({ ok: false, message: body.statusMessage || body.message || `upload refused (HTTP ${xhr.status})` })
    }
    xhr.onerror = () => resolve({ ok: false, message: 'the upload did not reach the server' })
    xhr.send(form)
  })
}
