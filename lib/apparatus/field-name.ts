/** "apparatus.setup.sources[0].id" (a server path) → "apparatus.setup.sources.0.label" (a form field). */
export function fieldNameOf(path: string): string {
  return path.replace(/\[(\d+)\]/g, ".$1").replace(/(sources\.\d+)\.id$/, "$1.label");
}
