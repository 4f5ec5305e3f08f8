/** The analysed file as the report names it: `holdout.xlsx, sheet “Holdout 2025”` for a workbook, else its name. */
export function fileWithSheet(input: { fileName: string; sheet?: string }): string {
  return input.sheet === undefined ? input.fileName : `${input.fileName}, sheet “${input.sheet}”`;
}
