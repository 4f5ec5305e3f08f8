import { type ChangeEvent, type DragEvent, useEffect, useId, useRef, useState } from 'react';
import { type HoldoutInfo } from '@shared/comparisons';
import { type UploadProgress, errorMessage, isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { formatBytes } from '@/lib/format';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { ProgressBar } from '@/components/progress-bar';
import { Select } from '@/components/select';
import { useUploadHoldout } from '@/features/holdouts/api/upload-holdout';
import { RowErrorsTable } from '@/features/holdouts/components/row-errors-table';
import { rowErrorsFrom } from '@/features/holdouts/lib/row-errors';
import { looksLikeWorkbook, workbookSheetNames } from '@/features/holdouts/lib/workbook-sheets';

/**
 * Step 1: choose a CSV file (or drop it here) and upload it with a real progress bar (upload
 * progress events); then the server reads it once for its columns, row count and SHA-256.
 */
export function UploadHoldoutForm({ onUploaded }: { onUploaded: (holdout: HoldoutInfo) => void }) {
  const inputId = useId();
  const hintId = useId();
  const [file, setFile] = useState<File | null>(null);
  /** A workbook's sheet names (read in the browser), null for CSV or an unreadable workbook. */
  const [sheets, setSheets] = useState<string[] | null>(null);
  const [sheet, setSheet] = useState<string | null>(null);
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const [dragging, setDragging] = useState(false);
  const abort = useRef<AbortController | null>(null);
  const uploadHoldout = useUploadHoldout();

  const choose = (chosen: File | null | undefined) => {
    if (!chosen) return;
    setFile(chosen);
    setSheets(null);
    setSheet(null);
    setProgress(null);
    uploadHoldout.reset();
  };

  // A workbook's sheets, to choose the one that holds the holdout (default: the first).
  useEffect(() => {
    if (!file || !looksLikeWorkbook(file)) return;
    let current = true;
    void workbookSheetNames(file).then((names) => {
      if (!current) return;
      setSheets(names);
      setSheet(names?.[0] ?? null);
    });
    return () => {
      current = false;
    };
  }, [file]);

  const start = () => {
    if (!file) return;
    abort.current = new AbortController();
    setProgress({ loaded: 0, total: file.size, fraction: 0 });
    uploadHoldout.mutate(
      { file, sheet, onProgress: setProgress, signal: abort.current.signal },
      { onSuccess: (holdout) => onUploaded(holdout) },
    );
  };

  const onDrop = (event: DragEvent<HTMLLabelElement>) => {
    event.preventDefault();
    setDragging(false);
    choose(event.dataTransfer.files?.[0]);
  };

  const sent = progress?.fraction === 1;
  const rowErrors = rowErrorsFrom(uploadHoldout.error);
  const cancelled = isApiError(uploadHoldout.error, 'aborted');

  return (
    <div className="space-y-5">
      <div>
        <label
          htmlFor={inputId}
          onDragOver={(event) => {
            event.preventDefault();
            setDragging(true);
          }}
          onDragLeave={() => setDragging(false)}
          onDrop={onDrop}
          className={cn(
            'flex cursor-pointer flex-col items-center gap-1 rounded-lg border-2 border-dashed px-6 py-8 text-center',
            dragging ? 'border-court-500 bg-court-50' : 'border-line-strong bg-paper-raised hover:bg-paper',
          )}
        >
          <span className="text-sm font-semibold text-ink">Holdout file (CSV or .xlsx)</span>
          <span id={hintId} className="max-w-lg text-sm text-ink-soft">
            One row per account with the observed outcome and both models’ scores; optionally an account id, segments and an amount. Choose a
            file or drop it here. From a workbook you choose the sheet (the first by default); its first row holds the column names.
          </span>
          <input
            id={inputId}
            type="file"
            accept=".csv,text/csv,text/plain,.xlsx,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
            aria-describedby={hintId}
            onChange={(event: ChangeEvent<HTMLInputElement>) => choose(event.target.files?.[0])}
            disabled={uploadHoldout.isPending}
            className="mt-3 text-sm file:mr-3 file:rounded-md file:border file:border-line-strong file:bg-paper-raised file:px-3 file:py-1.5 file:text-sm file:font-medium file:text-ink hover:file:bg-paper-sunk"
          />
        </label>
      </div>

      {file ? (
        <p className="text-sm text-ink-soft">
          Chosen: <span className="font-medium text-ink">{file.name}</span> · <span className="num">{formatBytes(file.size)}</span>
        </p>
      ) : null}

      {sheets && sheets.length > 0 ? (
        <Select
          label="Sheet with the holdout"
          hint={sheets.length === 1 ? 'The workbook has one sheet.' : `The workbook has ${sheets.length} sheets; the one chosen is read, its first row the column names.`}
          value={sheet ?? sheets[0]}
          onChange={(event) => setSheet(event.target.value)}
          disabled={uploadHoldout.isPending}
          options={sheets.map((name) => ({ value: name, label: name }))}
          className="max-w-sm"
        />
      ) : null}

      {uploadHoldout.isPending && progress ? (
        <div className="space-y-3">
          <ProgressBar
            label={sent ? `Reading ${file?.name ?? 'the file'}: columns, rows and SHA-256` : `Uploading ${file?.name ?? 'the file'}`}
            value={sent ? null : progress.fraction}
            valueText={
              sent
                ? 'Reading…'
                : progress.total
                  ? `${formatBytes(progress.loaded)} of ${formatBytes(progress.total)} (${Math.round((progress.fraction ?? 0) * 100)}%)`
                  : formatBytes(progress.loaded)
            }
          />
        </div>
      ) : null}

      {uploadHoldout.isError && !cancelled ? (
        <Alert tone="error" title="The file was not accepted">
          <p>{errorMessage(uploadHoldout.error)}</p>
          <p>Fix the file and upload it again. Nothing has been stored.</p>
        </Alert>
      ) : null}
      {cancelled ? (
        <Alert tone="info" title="Upload cancelled">
          <p>Nothing has been stored. Choose the file again to restart.</p>
        </Alert>
      ) : null}
      {rowErrors.length > 0 ? <RowErrorsTable errors={rowErrors} caption="Problems that stopped the upload" /> : null}

      <div className="flex flex-wrap gap-2">
        <Button variant="primary" onClick={start} disabled={!file} loading={uploadHoldout.isPending} loadingText={sent ? 'Reading the file…' : 'Uploading…'}>
          Upload the holdout
        </Button>
        {uploadHoldout.isPending ? <Button onClick={() => abort.current?.abort()}>Cancel</Button> : null}
      </div>
    </div>
  );
}
