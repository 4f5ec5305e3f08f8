import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type HoldoutInfo, holdoutSchema } from '@shared/comparisons';
import { type UploadProgress, upload } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

export interface UploadHoldoutInput {
  file: File;
  /** For an .xlsx workbook: the worksheet to read (the server reads the first without one). */
  sheet?: string | null;
  onProgress?: (progress: UploadProgress) => void;
  signal?: AbortSignal;
}

/**
 * POST /api/holdouts (modeler; multipart fields `sheet`, optional, and `file`) → 201 the holdout: columns, row count,
 * SHA-256, the first 20 rows and a guessed mapping. Sent with XMLHttpRequest for progress events.
 */
export async function uploadHoldout({ file, sheet, onProgress, signal }: UploadHoldoutInput): Promise<HoldoutInfo> {
  const form = new FormData();
  // The sheet goes before the file, so the server has it when the file arrives.
  if (sheet) form.append('sheet', sheet);
  form.append('file', file, file.name);
  return upload('/api/holdouts', form, { schema: holdoutSchema, onProgress, signal });
}

export function useUploadHoldout() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadHoldout,
    onSuccess: (holdout) => queryClient.setQueryData(queryKeys.holdouts.detail(holdout.id), holdout),
  });
}
