/** The one format module lives in shared/ (the server's PDF and workbook use it too). */
export * from '@shared/format';
