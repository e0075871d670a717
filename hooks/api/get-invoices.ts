import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export interface Invoice {
  id: string;
  number: string | null;
  status: 'draft' | 'open' | 'paid' | 'uncollectible' | 'void';
  amountDue: number;
  amountPaid: number;
  total: number;
  currency: string;
  created: string;
  periodStart: string;
  periodEnd: string;
  url: string | null;
}

export const getInvoices = () => apiFetch<{ items: Invoice[] }>('/billing/invoices').then((r) => r.items);

export const invoicesQueryOptions = () => queryOptions({ queryKey: keys.billing.invoices.queryKey, queryFn: getInvoices });

export const useInvoices = (enabled = true) => useQuery({ ...invoicesQueryOptions(), enabled });
