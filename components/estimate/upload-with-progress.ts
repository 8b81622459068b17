export type UploadProgress = { phase: "uploading"; fraction: number } | { phase: "measuring" };

export type UploadResult = { status: number; body: unknown };

/**
 * Sends a form with XMLHttpRequest, because fetch cannot report upload progress; resolves with
 * the status and parsed JSON body (null when the body is not JSON).
 */
export function uploadWithProgress(
  url: string,
  form: FormData,
  onProgress: (progress: UploadProgress) => void,
  signal?: AbortSignal,
): Promise<UploadResult> {
  return new Promise((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open("POST", url);
    request.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress({ phase: "uploading", fraction: event.loaded / event.total });
    };
    request.upload.onload = () => onProgress({ phase: "measuring" });
    request.onload = () => {
      let body: unknown = null;
      try {
        body = JSON.parse(request.responseText);
      } catch {
        // leave null: the caller reports a generic failure
      }
      resolve({ status: request.status, body });
    };
    request.onerror = () => reject(new Error("The upload failed: check your connection and try again."));
    request.onabort = () => reject(new DOMException("Upload cancelled", "AbortError"));
    signal?.addEventListener("abort", () => request.abort(), { once: true });
    request.send(form);
  });
}
