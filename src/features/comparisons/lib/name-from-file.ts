/** A name for a comparison from its file: "tallowmere-holdout-2025.csv" → "tallowmere holdout 2025". */
export function nameFromFile(fileName: string): string {
  const name = fileName.replace(/\.[^.]+$/, '').replace(/[-_]+/g, ' ').replace(/\s+/g, ' ').trim().slice(0, 160);
  return name || fileName.slice(0, 160);
}
