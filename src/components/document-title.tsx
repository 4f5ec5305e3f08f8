/** The browser tab's title for a page ("People · Scorecourt"); React hoists <title> into <head>. */
export function DocumentTitle({ children }: { children: string }) {
  return <title>{`${children} · Scorecourt`}</title>;
}
