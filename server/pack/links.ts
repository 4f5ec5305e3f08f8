/** The committee pack's PDF as a link for e-mails (the API route of pack/router.ts; signing in is needed to open it). */
export function packLink(publicUrl: string, id: number): string {
  return `${publicUrl.replace(/\/+$/, '')}/api/comparisons/${encodeURIComponent(String(id))}/export/pack.pdf`;
}
