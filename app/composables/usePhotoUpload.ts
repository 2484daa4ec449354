// Sends a multipart photo upload with XMLHttpRequest, because fetch reports no upload progress
// (the upload.onprogress event of XMLHttpRequest does: WHATWG XMLHttpRequest Standard §3.7).
import type { PhotoDto } from '#shared/types/photos'

export function usePhotoUpload() {
  const progress = ref<number | null>(null)
  function send(url: string, form: FormData): Promise<PhotoDto[]> {
    progress.value = 0
    return new Promise((resolve, reject) => {
      const xhr = new XMLHttpRequest()
      xhr.open('POST', url)
      xhr.setRequestHeader('accept', 'application/json')
      xhr.upload.onprogress = (e) => {
        if (e.lengthComputable) progress.value = Math.round((e.loaded / e.total) * 100)
      }
      xhr.onload = () => {
        progress.value = null
        let body: unknown = null
        try {
          body = JSON.parse(xhr.responseText)
        }
        catch { /* not JSON: a proxy's error page */ }
        if (xhr.status >= 200 && xhr.status < 300) resolve(body as PhotoDto[])
        else reject({ data: body ?? { message: `Upload failed (${xhr.status})` } })
      }
      xhr.onerror = () => {
        progress.value = null
        reject({ data: { message: 'The upload did not reach the server; check the connection and try again' } })
      }
      xhr.send(form)
    })
  }
  return { progress, send }
}
