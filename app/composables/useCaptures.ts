import type { CaptureDto } from '#shared/types/capture'

/**
 * A link's captures, refreshed every second while any extraction is queued or running
 * (the progress the job writes), and the upload action with its own upload progress.
 */
export function useCaptures(linkId: () => string) {
  const { data, refresh, error, status } = useFetch<CaptureDto[]>(() => `/api/links/${linkId()}/captures`, { key: `captures-${linkId()}`, default: () => [] })
  const working = computed(() => data.value.some((c) => c.status === 'queued' || c.status === 'running'))
  let timer: ReturnType<typeof setInterval> | undefined
  watch(
    working,
    (w) => {
      if (import.meta.server) return
      if (w && !timer) timer = setInterval(() => refresh(), 1000)
      if (!w && timer) {
        clearInterval(timer)
        timer = undefined
      }
    },
    { immediate: true },
  )
  onBeforeUnmount(() => timer && clearInterval(timer))

  const uploading = ref(false)
  /** 0..1 while the bytes go up */
  const uploadProgress = ref(0)
  const uploadError = ref<string | null>(null)

  /** Upload through XMLHttpRequest: fetch cannot report upload progress. */
  function upload(file: File, fields: Record<string, string>): Promise<CaptureDto | null> {
    uploading.value = true
    uploadProgress.value = 0
    uploadError.value = null
    const form = new FormData()
    for (const [k, v] of Object.entries(fields)) if (v !== '') form.set(k, v)
    form.set('file', file, file.name)
    return new Promise((resolve) => {
      const xhr = new XMLHttpRequest()
      xhr.open('POST', `/api/links/${linkId()}/captures`)
      xhr.setRequestHeader('accept', 'application/json')
      xhr.upload.onprogress = (e) => {
        if (e.lengthComputable) uploadProgress.value = e.loaded / e.total
      }
      xhr.onload = async () => {
        uploading.value = false
        let body: { statusMessage?: string; message?: string } & Partial<CaptureDto> = {}
        try {
          body = JSON.parse(xhr.responseText)
        } catch {
          // a non-JSON answer (a proxy's 413 page): reported by status below
        }
        if (xhr.status >= 200 && xhr.status < 300) {
          await refresh()
          resolve(body as CaptureDto)
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

  async function remove(id: number) {
    await $fetch(`/api/captures/${id}`, { method: 'DELETE' })
    await refresh()
  }

  return { captures: data, refresh, error, status, upload, uploading, uploadProgress, uploadError, remove }
}
