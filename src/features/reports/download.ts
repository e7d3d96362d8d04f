/**
 * Fetches a file the server writes and hands it to the browser as a download, so a refusal or a field
 * error is shown on the page instead of replacing it with the server's JSON.
 */
export class DownloadError extends Error {
  constructor(
    message: string,
    readonly fields: Record<string, string> = {},
  ) {
    super(message);
  }
}

export async function downloadFile(href: string): Promise<string> {
  const res = await fetch(href, { credentials: 'same-origin' });
  if (!res.ok) {
    type ErrorBody = { error?: { message?: string; fields?: Record<string, string> } };
    let body: ErrorBody = {};
    try {
      body = (await res.json()) as ErrorBody;
    } catch {
      // not JSON: fall through to the generic message
    }
    throw new DownloadError(body.error?.message ?? `The export failed (HTTP ${res.status}).`, body.error?.fields ?? {});
  }
  const name = /filename="([^"]+)"/.exec(res.headers.get('content-disposition') ?? '')?.[1] ?? 'benchrelay-export.csv';
  const url = URL.createObjectURL(await res.blob());
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  // the click has handed the blob to the download; give the browser a moment before letting it go
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
  return name;
}
