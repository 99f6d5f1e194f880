/** The browser tab's title; React 19 places <title> in the document head. */
export function PageTitle({ children }: { children: string }) {
  return <title>{`${children} · Quartermark`}</title>;
}
