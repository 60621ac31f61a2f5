// Reading rendered SVG in tests: the children of one mark group, by its mark type and layer name.
export function markGroup(svg: string, markType: string, layerName: string): string {
  const re = new RegExp(`<g class="mark-${markType} role-mark ${layerName}_marks"[^>]*>(.*?)</g>`, 's')
  const m = re.exec(svg)
  if (!m) throw new Error(`no ${markType} mark group named ${layerName} in the SVG`)
  return m[1] ?? ''
}

export function countTags(fragment: string, tag: string): number {
  return (fragment.match(new RegExp(`<${tag}[\\s>]`, 'g')) ?? []).length
}

export function ariaLabels(svg: string): string[] {
  return [...svg.matchAll(/aria-label="([^"]*)"/g)].map(m => m[1] ?? '')
}
