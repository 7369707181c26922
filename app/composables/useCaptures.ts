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

  /** Upload with progress (app/utils/upload.ts); refreshes the list when stored. */
  async function upload(file: File, fields: Record<string, string>): Promise<CaptureDto | null> {
    uploading.value = true
    uploadProgress.value = 0
    uploadError.value = null
    const form = new FormData()
    for (const [k, v] of Object.entries(fields)) if (v !== '') form.set(k, v)
    form.set('file', file, file.name)
    const answer = await uploadWithProgress<CaptureDto>(`/api/links/${linkId()}/captures`, form, (f) => (uploadProgress.value = f))
    uploading.value = false
    if (!answer.ok) {
      uploadError.value = answer.message
      return null
    }
    await refresh()
    return answer.body
  }

  async function remove(id: number) {
    await $fetch(`/api/captures/${id}`, { method: 'DELETE' })
    await refresh()
  }

  return { captures: data, refresh, error, status, upload, uploading, uploadProgress, uploadError, remove }
}
