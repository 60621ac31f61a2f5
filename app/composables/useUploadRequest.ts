// Sends a multipart upload with XMLHttpRequest, so the browser reports progress while it sends.
export interface UploadProgress {
  loaded: number
  total: number
}

export interface UploadReply<T> {
  status: number
  body: T
}

export function useUploadRequest() {
  const progress = ref<UploadProgress | null>(null)
  const sending = ref(false)

  function send<T>(url: string, form: FormData): Promise<UploadReply<T>> {
    sending.value = true
    progress.value = { loaded: 0, total: 0 }
    return new Promise((resolve, reject) => {
      const request = new XMLHttpRequest()
      request.open('POST', url)
      request.responseType = 'json'
      request.upload.onprogress = (event) => {
        progress.value = { loaded: event.loaded, total: event.lengthComputable ? event.total : 0 }
      }
      request.onload = () => {
        sending.value = false
        resolve({ status: request.status, body: request.response as T })
      }
      request.onerror = () => {
        sending.value = false
        reject(new Error('The upload was interrupted: the server could not be reached.'))
      }
      request.send(form)
    })
  }

  return { progress, sending, send }
}
