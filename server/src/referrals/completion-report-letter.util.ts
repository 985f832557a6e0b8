import type { Procedure, RecallReview } from '@ostium/shared';
import type { ComposedLetter } from './acknowledgement-letter.util.js';
import { contactPhrase, paragraphsHtml, PROCEDURE_WORDS, shortDate, toothWords } from './letter-format.util.js';

/** Everything the completion report says; stored on the letter when it is composed, so the PDF can be rendered again. */
export interface CompletionReportFacts {
  practice: { name: string; phone: string | null; email: string | null };
  location: { name: string; address: string | null; phone: string | null; timeZone: string };
  dentist: { name: string; practiceName: string | null };
  patient: { firstName: string; lastName: string; dateOfBirth: string };
  toothFdi: string;
  procedure: Procedure;
  referralReceivedOn: string;
  /** Dismissed visits in order, local date and times at the location. */
  visits: { date: string; startTime: string; endTime: string; endodontist: string }[];
  treatmentEndedOn: string;
  recall: RecallReview[];
  findings: string;
  completedBy: string | null;
  /** When the letter was written (ISO); the PDF's creation date. */
  issuedAt: string;
}

/** The caution every report carries (product.md "Cautions the product shows"). */
export const REPORT_CAUTION =
  'This report summarises the treatment for the referring dentist. Clinical decisions rest with the treating clinician, under local regulations and licensed practice.';

export const reportFileName = (f: Pick<CompletionReportFacts, 'toothFdi' | 'treatmentEndedOn'>) => `completion-report-fdi-${f.toothFdi}-${f.treatmentEndedOn}.pdf`;

export const completionReportSubject = (practiceName: string) => `Completion report – ${practiceName}`;

/**
 * The e-mail that carries the report: who and which tooth, that treatment has ended and the report is
 * attached. The clinical content (findings, visits, recall) stays in the attached PDF.
 */
export function composeCompletionReportEmail(f: CompletionReportFacts): ComposedLetter {
  const patient = `${f.patient.firstName} ${f.patient.lastName}`;
  const contact = contactPhrase(f.practice, f.location);
  const paragraphs = [
    `Dear ${f.dentist.name},`,
    `the ${PROCEDURE_WORDS[f.procedure]} of your patient ${patient}, tooth ${toothWords(f.toothFdi)}, ended on ${shortDate(f.treatmentEndedOn)}.`,
    'Our completion report with the visits, the findings and the recall plan is attached as a PDF.',
    contact ? `If you have any questions, please contact us (${contact}).` : 'If you have any questions, please contact us.',
    `Kind regards,\n${f.practice.name}`,
  ];
  return { subject: completionReportSubject(f.practice.name), text: `${paragraphs.join('\n\n')}\n`, html: paragraphsHtml(paragraphs) };
}
