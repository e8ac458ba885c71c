import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { LabelCheckViewSchema, PrintRunSchema, type PrintLabelsInput } from '@shared/contracts/labels';

export const labelQueries = {
  all: () => ['labels'] as const,
  check: (batchId: string, templateId: string, confirmNeedsReview: boolean) =>
    queryOptions({
      queryKey: [...labelQueries.all(), 'check', batchId, templateId, confirmNeedsReview],
      queryFn: ({ signal }) => api.get('/api/labels/check', LabelCheckViewSchema, { params: { batchId, templateId, confirmNeedsReview }, signal }),
    }),
  printRuns: (batchId?: string) =>
    queryOptions({
      queryKey: [...labelQueries.all(), 'print-runs', batchId ?? 'all'],
      queryFn: ({ signal }) => api.get('/api/labels/print-runs', z.array(PrintRunSchema), { params: { batchId }, signal }),
    }),
};

/** The file name from Content-Disposition, or a fallback. */
function fileNameOf(headers: Headers, fallback: string): string {
  return /filename="([^"]+)"/.exec(headers.get('Content-Disposition') ?? '')?.[1] ?? fallback;
}

/** Preview PDF (proof page and one sheet) as an object URL for an iframe; nothing is recorded. */
export function usePreviewLabels() {
  return useMutation({
    mutationFn: async (input: PrintLabelsInput) => URL.createObjectURL((await api.postForBlob('/api/labels/preview', input)).blob),
  });
}

/** Prints: the server checks, makes the PDF and records the run; the browser saves the file. */
export function usePrintLabels() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (input: PrintLabelsInput) => {
      const { blob, headers } = await api.postForBlob('/api/labels/print-runs', input);
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = fileNameOf(headers, 'labels.pdf');
      document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 60_000);
      return { printRunId: headers.get('X-Print-Run-Id') };
    },
    onSettled: () => qc.invalidateQueries({ queryKey: labelQueries.all() }),
  });
}
