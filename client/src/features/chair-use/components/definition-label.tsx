import { Text, Tooltip } from '@mantine/core';
import { REPORT_DEFINITIONS, type ReportDefinitionKey } from '@ostium/shared';
import type { ReactNode } from 'react';

/**
 * A figure's label with its definition (shared REPORT_DEFINITIONS, the text the server computes by) on
 * hover and on keyboard focus; the dotted underline says there is more to read.
 */
export function DefinitionLabel({ term, children }: { term: ReportDefinitionKey; children: ReactNode }) {
  return (
    <Tooltip label={REPORT_DEFINITIONS[term]} multiline w={320} withArrow arrowPosition="side" position="top-start" inline events={{ hover: true, focus: true, touch: true }} openDelay={150}>
      <Text
        component="span"
        inherit
        tabIndex={0}
        data-definition={term}
        className="ostium-report-term"
      >
        {children}
      </Text>
    </Tooltip>
  );
}
