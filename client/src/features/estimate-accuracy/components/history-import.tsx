import { Alert, Button, Card, Code, FileInput, Group, List, Progress, SegmentedControl, Stack, Text, Title } from '@mantine/core';
import type { ToothNotation } from '@ostium/shared';
import { IconCheck, IconFileSpreadsheet, IconUpload } from '@tabler/icons-react';
import { useState } from 'react';
import { ApiError } from '../../../lib/api-client';
import { usePractice } from '../../practice/api/practice';
import { groupImportErrors } from '../accuracy.util';
import { useImportHistory } from '../api/accuracy';

export const IMPORT_COLUMNS = 'date, tooth, procedure, canals, level, operator_email, actual_minutes';
const SHOWN_LINES = 100;

/** CSV of past visits: uploaded with a progress bar; one bad line imports nothing and every bad line is listed. */
export function HistoryImport() {
  const practiceNotation = usePractice().data?.settings.toothNotation ?? 'fdi';
  const [file, setFile] = useState<File | null>(null);
  const [notation, setNotation] = useState<ToothNotation | null>(null);
  const [progress, setProgress] = useState(0);
  const importer = useImportHistory();
  const shownNotation = notation ?? practiceNotation;

  const start = () => {
    if (!file) return;
    setProgress(0);
    importer.mutate({ file, notation: shownNotation, onProgress: setProgress }, { onSuccess: () => setFile(null) });
  };

  const error = importer.error;
  const lines = error instanceof ApiError ? groupImportErrors(error.errors) : [];

  return (
    <Card component="section" aria-label="Import visit history">
      <Stack gap="sm">
        <div>
          <Title order={3} fz="md">
            Import visit history
          </Title>
          <Text fz="xs" c="dimmed">
            One past visit per line, with the columns <Code>{IMPORT_COLUMNS}</Code>. Dates as YYYY-MM-DD, level low, moderate or high. Every line is checked
            first; if any line has a problem nothing is imported.
          </Text>
        </div>
        <Group align="flex-end" gap="sm" wrap="wrap">
          <FileInput
            label="CSV file"
            placeholder="Choose a .csv file"
            accept=".csv,text/csv"
            leftSection={<IconFileSpreadsheet size={16} />}
            clearable
            w={300}
            value={file}
            onChange={(f) => {
              setFile(f);
              importer.reset();
            }}
            disabled={importer.isPending}
          />
          <div>
            <Text fz="sm" fw={500} mb={4}>
              Tooth numbers in the file
            </Text>
            <SegmentedControl
              aria-label="Tooth numbers in the file"
              value={shownNotation}
              onChange={(v) => setNotation(v as ToothNotation)}
              data={[
                { value: 'fdi', label: 'FDI' },
                { value: 'universal', label: 'Universal' },
              ]}
              disabled={importer.isPending}
            />
          </div>
          <Button leftSection={<IconUpload size={16} />} onClick={start} disabled={!file} loading={importer.isPending}>
            Import
          </Button>
        </Group>

        {importer.isPending && (
          <Stack gap={4}>
            <Progress value={Math.round(progress * 100)} aria-label="Upload progress" animated={progress >= 1} />
            <Text fz="xs" c="dimmed" aria-live="polite">
              {progress < 1 ? `Uploading… ${Math.round(progress * 100)} %` : 'Uploaded; checking every line…'}
            </Text>
          </Stack>
        )}

        {importer.isSuccess && (
          <Alert color="lagoon" variant="light" icon={<IconCheck size={18} />} title={`Imported ${importer.data.imported} visit${importer.data.imported === 1 ? '' : 's'}`}>
            The calibration is updated; the accuracy report shows the new figures and new estimates use them.
          </Alert>
        )}

        {error && (
          <Alert color="red" variant="light" title="Nothing imported" role="alert">
            <Text fz="sm">{error.message}</Text>
            {lines.length > 0 && (
              <List size="sm" mt="xs" spacing={2} aria-label="Problems by line">
                {lines.slice(0, SHOWN_LINES).map((l) => (
                  <List.Item key={l.where}>
                    <Text span fw={600} fz="sm">
                      {l.where}:
                    </Text>{' '}
                    {l.messages.join('; ')}
                  </List.Item>
                ))}
              </List>
            )}
            {lines.length > SHOWN_LINES && (
              <Text fz="xs" mt={4}>
                and {lines.length - SHOWN_LINES} more lines.
              </Text>
            )}
          </Alert>
        )}
      </Stack>
    </Card>
  );
}
