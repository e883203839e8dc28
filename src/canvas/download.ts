/** Saves text or a data URL as a file through a temporary link (nothing leaves the page). */
export function downloadText(fileName: string, mime: string, text: string): void {
  const url = URL.createObjectURL(new Blob([text], { type: mime }));
  try {
    downloadUrl(fileName, url);
  } finally {
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
  }
}

export function downloadUrl(fileName: string, url: string): void {
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  document.body.appendChild(a);
  a.click();
  a.remove();
}
