import { useMutation } from '@tanstack/react-query';
import { type ValidationReport, validationReportSchema } from '@shared/comparisons';
import { type ColumnMapping } from '@shared/report';
import { api } from '@/lib/api-client';

export interface ValidateMappingInput {
  holdoutId: number;
  mapping: ColumnMapping;
  dropMissing: boolean;
}

/**
 * POST /api/holdouts/:id/validate { mapping, dropMissing } → the validation report: the first
 * problems by row and column, or a summary (rows, bad rate, missing values, warnings).
 */
export async function validateMapping({ holdoutId, mapping, dropMissing }: ValidateMappingInput): Promise<ValidationReport> {
  return api.post(`/api/holdouts/${holdoutId}/validate`, { mapping, dropMissing }, { schema: validationReportSchema });
}

export function useValidateMapping() {
  return useMutation({ mutationFn: validateMapping });
}
