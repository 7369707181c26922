import type { DatasheetDto } from '#shared/types/capture'

/**
 * A part's datasheet PDFs (every role that may read the part) and the upload action with
 * its own upload progress (engineer, admin; team parts only, the server says 403 otherwise).
 */
export function usePartDatasheets(partId: () => string) {
  const { data, refresh, error, status } = useFetch<DatasheetDto[]>(() => `/api/parts/${partId()}/datasheets`, {
    key: `datasheets-${partId()}`,
    default: () => [],
  })

  const uploading = ref(false)
  /** 0..1 while the bytes go up */
  const uploadProgress = ref(0)
  const uploadError = ref<string | null>(null)

  /** Upload through XMLHttpRequest: fetch cannot report upload progress. */
  function upload(file: File): Promise<DatasheetDto | null> {
    uploading.value = true
    uploadProgress.value = 0
    uploadError.value = null
    const form = new FormData()
    form.set('file', file, file.name)
    return new Promise((resolve) => {
      const xhr = new XMLHttpRequest()
      xhr.open('POST', `/api/parts/${partId()}/datasheets`)
      xhr.setRequestHeader('accept', 'application/json')
      xhr.upload.onprogress = (e) => {
        if (e.lengthComputable) uploadProgress.value = e.loaded / e.total
      }
      xhr.onload = async () => {
        uploading.value = false
        let body: { statusMessage?: string; message?: string } & Partial<DatasheetDto> = {}
        try {
          body = JSON.parse(xhr.responseText)
        } catch {
          // a non-JSON answer (a proxy's 413 page): reported by status below
        }
        if (xhr.status >= 200 && xhr.status < 300) {
          await refresh()
          resolve(body as DatasheetDto)
        } else {
          uploadError.value = body.statusMessage || body.message || `upload refused (HTTP ${xhr.status})`
          resolve(null)
        }
      }
      xhr.onerror = () => {
        uploading.value = false
        uploadError.value = 'the upload did not reach the server'
        resolve(null)
      }
      xhr.send(form)
    })
  }

  return { datasheets: data, refresh, error, status, upload, uploading, uploadProgress, uploadError }
}
