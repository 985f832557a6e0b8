import { Alert, Button, Group, SegmentedControl, Stack, Text, Textarea, TextInput } from '@mantine/core';
import type { MessageChannel } from '@ostium/shared';
import { IconSend } from '@tabler/icons-react';
import { useState } from 'react';
import { ApiError } from '../../../lib/api-client';
import { useSendDeskReply } from '../api/replies';
import { deskTextAsSent, OPT_OUT_HINT } from '../replies.util';
import { countText, describeCount } from '../sms-count.util';

export interface ReplyBoxProps {
  patientId: number;
  phone: string | null;
  email: string | null;
  smsConsent: boolean | null;
}

/** Why a text cannot go to this patient, or null when it can. */
export function textBlockedReason({ phone, smsConsent }: Pick<ReplyBoxProps, 'phone' | 'smsConsent'>): string | null {
  if (!phone) return 'No mobile number on file.';
  if (smsConsent !== true) return 'No text consent on file (never given, or withdrawn with STOP); write an e-mail or call.';
  return null;
}

/** The desk's answer in a thread: a text counted by encoding as it is typed, or an e-mail. */
export function ReplyBox({ patientId, phone, email, smsConsent }: ReplyBoxProps) {
  const textBlocked = textBlockedReason({ phone, smsConsent });
  const emailBlocked = email ? null : 'No e-mail address on file.';
  const [channel, setChannel] = useState<MessageChannel>(textBlocked && !emailBlocked ? 'email' : 'sms');
  const [body, setBody] = useState('');
  const [subject, setSubject] = useState('');
  const send = useSendDeskReply(patientId);

  const blocked = channel === 'sms' ? textBlocked : emailBlocked;
  const asSent = deskTextAsSent(body);
  const count = countText(asSent.text);
  const tooLong = channel === 'sms' && count.used > count.limit;
  const err = send.error instanceof ApiError ? send.error : null;
  const canSend = !blocked && body.trim() !== '' && !tooLong;

  const submit = () =>
    send.mutate(channel === 'sms' || !subject.trim() ? { channel, body: body.trim() } : { channel, subject: subject.trim(), body: body.trim() }, {
      onSuccess: () => {
        setBody('');
        setSubject('');
      },
    });

  return (
    <Stack
      gap="xs"
      component="form"
      aria-label="Reply"
      onSubmit={(e) => {
        e.preventDefault();
        if (canSend) submit();
      }}
    >
      <Group justify="space-between" gap="xs">
        <SegmentedControl
          size="xs"
          aria-label="Channel"
          value={channel}
          onChange={(v) => {
            setChannel(v as MessageChannel);
            send.reset();
          }}
          data={[
            { value: 'sms', label: 'Text', disabled: !!textBlocked },
            { value: 'email', label: 'E-mail', disabled: !!emailBlocked },
          ]}
        />
        {channel === 'sms' && !textBlocked && (
          <Text fz="xs" c={tooLong ? 'red.8' : 'dimmed'} fw={tooLong ? 700 : 500} data-testid="text-counter" aria-live="polite">
            {describeCount(count)}
          </Text>
        )}
      </Group>
      {textBlocked && (
        <Text fz="xs" c="dimmed" data-testid="text-blocked">
          Texting is off: {textBlocked}
        </Text>
      )}
      {emailBlocked && (
        <Text fz="xs" c="dimmed" data-testid="email-blocked">
          E-mail is off: {emailBlocked}
        </Text>
      )}
      {blocked ? null : (
        <>
          {channel === 'email' && <TextInput size="sm" label="Subject" placeholder="A message from the practice" value={subject} onChange={(e) => setSubject(e.currentTarget.value)} error={err?.field('subject')} />}
          <Textarea
            label={channel === 'sms' ? 'Your text' : 'Your e-mail'}
            rows={3}
            value={body}
            onChange={(e) => setBody(e.currentTarget.value)}
            error={err?.field('body')}
            description={channel === 'sms' ? 'No clinical detail in texts: date, time, place and how to reply.' : undefined}
          />
          {channel === 'sms' && asSent.hintAdded && (
            <Text fz="xs" c="dimmed" data-testid="hint-added">
              “{OPT_OUT_HINT}” is added at the end and counted, since the text does not say how to opt out.
            </Text>
          )}
          {channel === 'sms' && count.firstWide && (
            <Text fz="xs" c="amber.9">
              “{count.firstWide}” is outside the GSM-7 alphabet, so this text counts in UCS-2 and one segment holds {count.limit} characters.
            </Text>
          )}
          {tooLong && (
            <Text fz="xs" c="red.8" role="alert">
              Too long for one text: shorten it, or send an e-mail.
            </Text>
          )}
          {send.isError && !err?.errors.length && (
            <Alert color="red" variant="light" role="alert" p="xs">
              {(send.error as Error).message}
            </Alert>
          )}
          <Group justify="flex-end">
            <Button type="submit" size="sm" leftSection={<IconSend size={14} />} disabled={!canSend} loading={send.isPending}>
              {channel === 'sms' ? 'Send text' : 'Send e-mail'}
            </Button>
          </Group>
        </>
      )}
    </Stack>
  );
}
