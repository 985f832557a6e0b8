import { useDebouncedValue } from '@mantine/hooks';
import type { ReminderSettings, ReminderSettingsResponse, TemplatePreviewRequest, TemplatePreviewResponse } from '@ostium/shared';
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const reminderSettingsKeys = {
  all: ['settings', 'reminders'] as const,
  current: () => [...reminderSettingsKeys.all, 'current'] as const,
  preview: (req: TemplatePreviewRequest) => [...reminderSettingsKeys.all, 'preview', req] as const,
};

export const reminderSettingsQuery = () =>
  queryOptions({ queryKey: reminderSettingsKeys.current(), queryFn: ({ signal }) => api<ReminderSettingsResponse>('/settings/reminders', { signal }) });

export const useReminderSettings = () => useQuery(reminderSettingsQuery());

export function useSaveReminderSettings() {
  const qc = useQueryClient();
  return useMutation({
    // The version we read travels with the save; the server answers 409 when someone saved in between.
    mutationFn: (body: { settings: ReminderSettings; version: number }) => api<ReminderSettingsResponse>('/settings/reminders', { method: 'PUT', body }),
    onSuccess: (saved) => qc.setQueryData(reminderSettingsKeys.current(), saved),
  });
}

export const PREVIEW_DEBOUNCE_MS = 300;

/** The template as a patient would get it, with its length by encoding; asks once typing rests. */
export function useTemplatePreview(req: TemplatePreviewRequest | null) {
  const [settled] = useDebouncedValue(req, PREVIEW_DEBOUNCE_MS);
  const query = useQuery({
    queryKey: reminderSettingsKeys.preview(settled ?? { channel: 'sms', body: '' }),
    queryFn: ({ signal }) => api<TemplatePreviewResponse>('/settings/reminders/preview', { method: 'POST', body: settled, signal }),
    enabled: settled !== null && settled.body.trim() !== '',
    placeholderData: keepPreviousData,
    staleTime: 60_000,
  });
  return { ...query, settling: JSON.stringify(req) !== JSON.stringify(settled) };
}
