import '@mantine/dropzone/styles.css';
import { ActionIcon, Badge, Button, Group, Progress, Stack, Text, ThemeIcon } from '@mantine/core';
import { Dropzone, MIME_TYPES, type FileRejection } from '@mantine/dropzone';
import { IconCheck, IconFileTypePdf, IconPhoto, IconRefresh, IconUpload, IconX } from '@tabler/icons-react';
import type { AttachmentUploads, UploadItem } from '../use-attachment-uploads';

export const MAX_BYTES = 20 * 1024 * 1024;
const ACCEPT = [MIME_TYPES.jpeg, MIME_TYPES.png, MIME_TYPES.pdf];

export function fileSize(bytes: number) {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${Math.round(bytes / 1024)} KB`;
  return `${(bytes / 1024 / 1024).toFixed(1)} MB`;
}

function reasonFor(r: FileRejection): string {
  const codes = r.errors.map((e) => e.code);
  if (codes.includes('file-too-large')) return `Too large: ${fileSize(r.file.size)}; the limit is 20 MB per file`;
  if (codes.includes('file-invalid-type')) return 'Not a JPEG, PNG or PDF file';
  return r.errors.map((e) => e.message).join('; ');
}

export function AttachmentsField({ uploads, error }: { uploads: AttachmentUploads; error?: string }) {
  return (
    <Stack gap="xs">
      <Dropzone
        onDrop={uploads.add}
        onReject={(rs) => uploads.refuse(rs.map((r) => ({ file: r.file, reason: reasonFor(r) })))}
        accept={ACCEPT}
        maxSize={MAX_BYTES}
        aria-label="Attachments: drop radiographs or letters, or press Enter to choose files"
        radius="md"
        p="md"
        bg="white"
      >
        <Group justify="center" gap="md" mih={64} style={{ pointerEvents: 'none' }}>
          <Dropzone.Accept>
            <IconUpload size={28} color="var(--mantine-color-lagoon-7)" />
          </Dropzone.Accept>
          <Dropzone.Reject>
            <IconX size={28} color="var(--mantine-color-red-6)" />
          </Dropzone.Reject>
          <Dropzone.Idle>
            <IconPhoto size={28} color="var(--mantine-color-stone-5)" />
          </Dropzone.Idle>
          <div>
            <Text fz="sm" fw={600}>
              Drop radiographs (JPEG, PNG) or letters (PDF) here, or click to choose
            </Text>
            <Text fz="xs" c="dimmed">
              Up to 20 MB each. Every file uploads at once; the rest of the form stays as it is.
            </Text>
          </div>
        </Group>
      </Dropzone>
      {error && (
        <Text fz="xs" c="red.7" role="alert">
          {error}
        </Text>
      )}
      {uploads.items.length > 0 && (
        <Stack gap={6} component="ul" aria-label="Attached files" p={0} m={0} style={{ listStyle: 'none' }}>
          {uploads.items.map((i) => (
            <UploadRow key={i.key} item={i} onRemove={() => uploads.remove(i.key)} onRetry={() => uploads.retry(i.key)} />
          ))}
        </Stack>
      )}
    </Stack>
  );
}

function UploadRow({ item, onRemove, onRetry }: { item: UploadItem; onRemove: () => void; onRetry: () => void }) {
  const pct = Math.round(item.progress * 100);
  const isPdf = item.kind === 'letter';
  const retriable = item.state === 'failed' && item.retriable;
  return (
    <Group component="li" gap="sm" wrap="nowrap" aria-label={item.file.name} px="xs" py={4} style={{ borderRadius: 'var(--mantine-radius-sm)', background: item.state === 'failed' ? 'var(--mantine-color-red-0)' : 'var(--mantine-color-white)' }}>
      <ThemeIcon variant="light" color={item.state === 'failed' ? 'red' : isPdf ? 'plum' : 'lagoon'} size={30}>
        {isPdf ? <IconFileTypePdf size={18} /> : <IconPhoto size={18} />}
      </ThemeIcon>
      <Stack gap={2} style={{ flex: 1, minWidth: 0 }}>
        <Group gap={6} wrap="nowrap">
          <Text fz="sm" fw={600} truncate>
            {item.file.name}
          </Text>
          <Text fz="xs" c="dimmed" style={{ whiteSpace: 'nowrap' }}>
            {fileSize(item.file.size)}
          </Text>
          <Badge size="xs" color={isPdf ? 'plum' : 'lagoon'}>
            {isPdf ? 'letter' : 'radiograph'}
          </Badge>
        </Group>
        {item.state === 'uploading' && <Progress value={pct} size="sm" aria-label={`Uploading ${item.file.name}`} animated={pct < 100} />}
        {item.state === 'done' && (
          <Group gap={4}>
            <IconCheck size={14} color="var(--mantine-color-lagoon-7)" />
            <Text fz="xs" c="lagoon.8">
              Uploaded
            </Text>
          </Group>
        )}
        {item.state === 'failed' && (
          <Text fz="xs" c="red.8" role="alert">
            Not attached: {item.error}
          </Text>
        )}
      </Stack>
      {retriable && (
        <Button size="compact-xs" variant="subtle" leftSection={<IconRefresh size={12} />} onClick={onRetry}>
          Try again
        </Button>
      )}
      <ActionIcon variant="subtle" color="stone" onClick={onRemove} aria-label={`Remove ${item.file.name}`}>
        <IconX size={16} />
      </ActionIcon>
    </Group>
  );
}
