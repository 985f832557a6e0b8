import { Card, Text } from '@mantine/core';
import type { ReportDefinitionKey } from '@ostium/shared';
import type { ReactNode } from 'react';
import { DefinitionLabel } from './definition-label';

/** One key figure: label (with its definition on hover), the value, and the parts it is made of. */
export function StatCard({ label, value, parts, term }: { label: string; value: string; parts?: ReactNode; term?: ReportDefinitionKey }) {
  return (
    <Card p="md" component="figure" m={0} aria-label={label} className="ostium-report-stat">
      <Text component="figcaption" fz="xs" c="dimmed" fw={600} tt="uppercase" style={{ letterSpacing: '0.05em' }}>
        {term ? <DefinitionLabel term={term}>{label}</DefinitionLabel> : label}
      </Text>
      <Text fz={22} fw={700} data-figure="">
        {value}
      </Text>
      {parts && (
        <Text fz="xs" c="dimmed">
          {parts}
        </Text>
      )}
    </Card>
  );
}
