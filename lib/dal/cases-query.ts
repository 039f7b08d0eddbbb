import { z } from 'zod';
import { caseStatuses } from '@/db/schema';

/** The cases list's query string, shared by the API, the page and the client table. */
export const caseListQuerySchema = z.object({
  page: z.coerce.number().int('page must be a whole number').min(1, 'page starts at 1').max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100, 'at most 100 per page').default(25),
  status: z
    .string()
    .optional()
    .transform((value) => (value ? value.split(',').filter(Boolean) : undefined))
    .pipe(z.array(z.enum(caseStatuses, { error: `each status must be one of ${caseStatuses.join(', ')}` })).optional()),
  supplier: z.uuid('supplier must be an organisation id').optional(),
  lab: z.uuid('lab must be an organisation id').optional(),
  overdue: z.enum(['true', 'false']).optional().transform((v) => (v === undefined ? undefined : v === 'true')),
  q: z.string().trim().max(100, 'search text is limited to 100 characters').optional(),
  sort: z.enum(['openedAt', 'number', 'status', 'dueAt', 'deliveredAt', 'value']).default('openedAt'),
  order: z.enum(['asc', 'desc']).default('desc'),
});

export type CaseListQuery = z.infer<typeof caseListQuerySchema>;
