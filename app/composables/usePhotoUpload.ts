// Sends a multipart photo upload with XMLHttpRequest, because fetch reports no upload progress
// (the upload.onprogress event of XMLHttpRequest does: WHATWG XMLHttpRequest Standard §3.7).
// `postPhotos` is the plain sender (the tablet's outbox uses it for photos kept offline);
// a refusal rejects with the answer's `data` and `response.status` as $fetch's errors do, and
// a request that never reached the server with no status.
import type { PhotoDto } from '#shared/types/photos'

export function postPhotos(url: string, form: FormData, onProgress: (percent: number) => void): Promise<PhotoDto[]> {
  onProgress(0)
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest()
    xhr.open('POST', url)
    xhr.setRequestHeader('accept', 'application/json')
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(Math.round((e.loaded / e.total) * 100))
    }
    xhr.onload = () => {
      let body: unknown = null
      try {
        body = JSON.parse(xhr.responseText)
      }
      catch { /* not JSON: a proxy's error page */ }
      if (xhr.status >= 200 && xhr.status < 300) resolve(body as PhotoDto[])
      else reject({ data: body ?? { message: `Upload failed (${xhr.status})` }, response: { status: xhr.status } })
    }
    xhr.onerror = () => {
      reject({ data: { message: 'The upload did not reach the server; check the connection and try again' } })
    }
    xhr.send(form)
  })
}

export function usePhotoUpload() {
  const progress = ref<number | null>(null)
  async function send(url: string, form: FormData): Promise<PhotoDto[]> {
    try {
      return await postPhotos(url, form, (p) => {
        progress.value = p
      })
    }
    finally {
      progress.value = null
    }
  }
  return { progress, send }
}
