import { type HoldoutInfo } from '@shared/comparisons';
import { formatBytes, formatCount, formatDateTime, isoDateTime } from '@/lib/format';

/** What was uploaded: file, size, rows, columns and the SHA-256 that pins it for the record. */
export function HoldoutSummary({ holdout }: { holdout: HoldoutInfo }) {
  return (
    <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2 lg:grid-cols-4">
      <div>
        <dt className="text-xs font-medium text-ink-soft">File</dt>
        <dd className="font-medium break-words text-ink">
          {holdout.fileName}
          {holdout.sheet !== null ? <span className="font-normal text-ink-soft"> · sheet “{holdout.sheet}”</span> : null}
        </dd>
      </div>
      <div>
        <dt className="text-xs font-medium text-ink-soft">Rows and columns</dt>
        <dd className="num text-ink">
          {formatCount(holdout.rowCount)} rows · {formatCount(holdout.columns.length)} columns · {formatBytes(holdout.bytes)}
        </dd>
      </div>
      <div>
        <dt className="text-xs font-medium text-ink-soft">Uploaded</dt>
        <dd className="text-ink">
          {holdout.uploadedBy.name}, <time dateTime={isoDateTime(holdout.uploadedAt)}>{formatDateTime(holdout.uploadedAt)}</time>
        </dd>
      </div>
      <div className="sm:col-span-2 lg:col-span-1">
        <dt className="text-xs font-medium text-ink-soft">SHA-256</dt>
        <dd className="font-mono text-xs break-all text-ink" title={holdout.sha256}>
          {holdout.sha256}
        </dd>
      </div>
    </dl>
  );
}
