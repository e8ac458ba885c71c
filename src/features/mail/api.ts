import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { SentMailListSchema } from '@shared/contracts/mail';

export const mailQueries = {
  all: () => ['sent-mail'] as const,
  list: () => queryOptions({ queryKey: mailQueries.all(), queryFn: ({ signal }) => api.get('/api/sent-mail', SentMailListSchema, { signal }) }),
};
