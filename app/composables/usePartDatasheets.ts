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

  /** Upload with progress (app/utils/upload.ts); refreshes the list when stored. */
  async function upload(file: File): Promise<DatasheetDto | null> {
    uploading.value = true
    uploadProgress.value = 0
    uploadError.value = null
    const form = new FormData()
    form.set('file', file, file.name)
    const answer = await uploadWithProgress<DatasheetDto>(`/api/parts/${partId()}/datasheets`, form, (f) => (uploadProgress.value = f))
    uploading.value = false
    if (!answer.ok) {
      uploadError.value = answer.message
      return null
    }
    await refresh()
    return answer.body
  }

  return { datasheets: data, refresh, error, status, upload, uploading, uploadProgress, uploadError }
}
